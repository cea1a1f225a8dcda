#!/usr/bin/env Rscript
# Export real, openly published traces that no one on the project made, once,
# into test/fixtures/real/ as CSV the page's loader reads. Run from the
# repository root:
#
#   Rscript scripts/export-real-traces.R
#
# Needs Debian's r-cran-maldiquant and r-cran-pls (the data ship inside those
# packages; nothing is downloaded). Sources, licences and citations are in
# test/fixtures/real/README.md; the same lines head each CSV.
#
# Written values: MALDI-TOF m/z with 15 significant digits (the stored doubles
# to 15 digits), intensities as the integers the package stores; NIR log(1/R)
# with the 6 decimals the package stores. Nothing is smoothed, baseline
# corrected or otherwise changed.

suppressPackageStartupMessages({
  library(MALDIquant)
  library(pls)
})

out <- file.path("test", "fixtures", "real")
if (!dir.exists(out)) stop("run from the repository root (", out, " not found)")

write_lines <- function(path, header, body) {
  con <- file(path, open = "wb")
  on.exit(close(con))
  writeLines(c(header, body), con, sep = "\n", useBytes = TRUE)
  cat(sprintf("%s: %d data rows\n", path, length(body)))
}

# ---- MALDI-TOF: MALDIquant's fiedler2009subset ---------------------------
data(fiedler2009subset, package = "MALDIquant")
maldi_version <- as.character(packageVersion("MALDIquant"))
# list index -> file tag: a technical replicate pair (1, 2: Leipzig LC77) and
# one Heidelberg spectrum (9: HC49), see ?fiedler2009subset
picks <- c(1, 2, 9)
for (i in picks) {
  s <- fiedler2009subset[[i]]
  m <- mass(s)
  y <- intensity(s)
  stopifnot(all(is.finite(m)), all(is.finite(y)), !is.unsorted(m, strictly = TRUE))
  md <- metaData(s)
  header <- c(
    sprintf("Source: R package MALDIquant %s dataset fiedler2009subset item %d of 16 (%s)",
            maldi_version, i, md$fullName),
    "Data: raw linear-mode MALDI-TOF serum spectrum (Bruker Autoflex) - not smoothed and not baseline corrected",
    "Citation: Fiedler GM et al. (2009) Clin Cancer Res 15(11):3812-3819 doi:10.1158/1078-0432.CCR-08-2701",
    "Package: Gibb S and Strimmer K (2012) Bioinformatics 28:2270-2271 doi:10.1093/bioinformatics/bts447",
    "Licence: GPL-3+ (as the MALDIquant package)",
    "Exported by scripts/export-real-traces.R",
    "m/z (Da),Intensity (counts)"
  )
  body <- paste(format(m, digits = 15, trim = TRUE, scientific = FALSE),
                format(y, trim = TRUE, scientific = FALSE), sep = ",")
  write_lines(file.path(out, sprintf("maldi-fiedler2009-%02d.csv", i)), header, body)
}

# ---- NIR: pls's gasoline -------------------------------------------------
data(gasoline, package = "pls")
pls_version <- as.character(packageVersion("pls"))
nir <- unclass(gasoline$NIR)
wl <- as.numeric(sub(" nm$", "", colnames(nir)))
stopifnot(length(wl) == 401, ncol(nir) == 401, all(is.finite(nir)))
n <- nrow(nir)
header <- c(
  sprintf("Source: R package pls %s dataset gasoline (%d samples x %d wavelengths)",
          pls_version, n, length(wl)),
  "Data: NIR diffuse reflectance spectra of gasoline as log(1/R) from 900 to 1700 nm in 2 nm steps",
  "Citation: Kalivas JH (1997) Chemometr Intell Lab Syst 37:255-259",
  "Package: Liland KH - Mevik B-H - Wehrens R: pls (CRAN)",
  "Licence: GPL-2 (as the pls package)",
  "Exported by scripts/export-real-traces.R - one column per sample; octane numbers in gasoline-octane.csv",
  paste(c("Wavelength (nm)", sprintf("Sample %d log(1/R)", seq_len(n))), collapse = ",")
)
body <- apply(cbind(wl, t(nir)), 1, function(r) {
  paste(c(format(r[1], trim = TRUE), formatC(r[-1], format = "f", digits = 6)), collapse = ",")
})
write_lines(file.path(out, "gasoline-nir.csv"), header, body)

oct <- c(
  "Source: R package pls dataset gasoline - octane number of each sample",
  "Sample,Octane number",
  paste(seq_len(n), format(gasoline$octane, nsmall = 2, trim = TRUE), sep = ",")
)
con <- file(file.path(out, "gasoline-octane.csv"), open = "wb")
writeLines(oct, con, sep = "\n")
close(con)
cat("done\n")
