/**
 * The command line's help texts. The README quotes them word for word (a
 * test keeps the two equal), so they are written in the README's words.
 */

export const MAIN_HELP = `Usage: tracewright <command> [options]

Runs Tracewright's analysis from a terminal: the same core, the same
processing method file and the same exports as the page, without a browser.

Commands:
  analyse <file|folder>...   analyse traces and write the cleaned trace, the
                             peak table, the report and a summary per trace
                             (see: tracewright analyse --help)

Options:
  -h, --help                 show this text
  --version                  show the version

Exit status: 0 every input was analysed; 1 an input could not be read or
analysed (the others were still written); 2 usage error, a method file that
fails validation, or a blank or scan that cannot be read (nothing written).

Tracewright is not a validated system; the laboratory's own procedures,
validated methods and regulators' requirements govern.
`;

export const ANALYSE_HELP = `Usage: tracewright analyse <file|folder>... [options]

Analyses every trace of each file with one processing method and writes, per
trace, into the output folder:
  <stem>-cleaned.csv    the cleaned trace (as the page's export)
  <stem>-peaks.csv      the peak table (as the page's export)
  <stem>-report.html    the report (as the page's, plots drawn as SVG)
  <stem>-summary.json   the summary for other programs (schema 1)
With --standard and --amounts, the run also writes, once:
  calibration.json          the calibration per named peak and every
                            analysed trace's amounts with their intervals
  calibration-table.csv     the standards and curves as a table
  amounts.csv               the amounts with intervals, marks and limits
With --combine, the run also writes, once:
  peaks-combined.csv        peaks matched by retention time across every
                            trace written, with the mean and %RSD of
                            retention time and area
<stem> is the file name without its extension, made safe for file names as
the page does, followed by _<trace name> when the file holds several traces;
a name used twice in one run gets -2, -3, ... in input order. A folder means
every file directly in it, in name order.

Options:
  --method FILE          processing method saved by the page (steps and
                         analysis settings); default: no steps, default
                         settings
  --blank FILE           blank run for the blank-subtraction step and the
                         2H/h noise range
  --scan FILE            a repeated scan for ensemble averaging; give once
                         per scan
  --trace NAME           analyse only the trace of this name (a column or
                         block name) in files holding several
  --trace-index N        analyse only the trace at this position (0 = first)
  --quiet-range FROM:TO  quiet baseline stretch in x-units (decimal point,
                         negative values allowed, e.g. -0.5:1.25); noise is
                         then the RMS about a straight line over it
  --delimiter C          read text files with this field separator: , ; tab
                         or space
  --decimal point|comma  read text files with this decimal sign
  --out DIR              output folder (default: the current folder); made
                         when missing
  --jobs N               analyse N files at a time (default 1); the files
                         written are the same for any N
  --json                 also write each summary as one line on standard
                         output
  --named-peaks FILE     named-peak table (CSV: name, position, window);
                         replaces the one saved in the method
  --standard FILE        a standard run, analysed with the same method;
                         give once per standard
  --amounts FILE         known amounts of the named peaks in each standard
                         (CSV: standard,<name> (<unit>),...; one row per
                         standard file); needed with --standard
  --fit-region FROM:TO   fit this x-range with a sum of peak shapes on a
                         local baseline and let BIC choose how many peaks
                         it holds; give once per region. The fits go into
                         the peak CSV (fitted areas), the report and the
                         summary's "fits"
  --fit-shape S          gaussian, lorentzian, pseudo-voigt or emg
                         (default gaussian)
  --fit-baseline B       line or quadratic (default line)
  --fit-peaks N          largest peak count tried, 1 to 4 (default 3)
  --fit-on raw|processed fit the raw trace (default) or the method's
                         output; the other is fitted too, to say whether
                         it supports the same count
  --figures              add the figures of chromatography to the peak CSV
                         and report (retention time, tailing, asymmetry,
                         plate number, resolution)
  --dead-time T          dead time in x-units, with --figures: adds the
                         retention factor and selectivity
  --combine              also write peaks-combined.csv (see above)
  --match-window W       matching window in x-units for --combine (default:
                         half the median half-height width)
  -h, --help             show this text

Where the page would have to ask (numbers that read two ways, which column
is meant), the command line does not guess: that file fails with a message
naming the option that settles it. Progress and problems go to standard
error; standard output stays empty unless --json is given.

Exit status: 0 every input was analysed (notices and steps that could not
run are in the summary's warnings and on standard error); 1 an input could
not be read or analysed (each is named with its line and reason; the others
were still written); 2 usage error, a method file that fails validation, or
a blank or scan that cannot be read (nothing written).

Time stamps: the time of the run, or SOURCE_DATE_EPOCH (seconds since 1970)
when that environment variable is set, for files that must be reproducible.
`;
