/**
 * One store in slices: inputs (traces and roles), notices (messages to the
 * user), recipe (the step stack with undo/redo), results (what the worker
 * computed for the current sample), view (zoom, what is drawn, click modes,
 * the selected peak), settings (noise and peak settings, decisions on peaks,
 * alternatives), session (how the session is being kept), calibration, fit
 * and report. The store holds data only, never a Worker or a plot.
 */
import { create } from 'zustand';
import { createCalibrationSlice, type CalibrationSlice } from './calibration-slice.ts';
import { createFitSlice, type FitSlice } from './fit-slice.ts';
import { createInputsSlice, type InputsSlice } from './inputs-slice.ts';
import { createNoticesSlice, type NoticesSlice } from './notices-slice.ts';
import { createRecipeSlice, type RecipeSlice } from './recipe-slice.ts';
import { createReportSlice, type ReportSlice } from './report-slice.ts';
import { createResultsSlice, type ResultsSlice } from './results-slice.ts';
import { createSessionSlice, type SessionSlice } from './session-slice.ts';
import { createSettingsSlice, type SettingsSlice } from './settings-slice.ts';
import { createViewSlice, type ViewSlice } from './view-slice.ts';

export type AppState = InputsSlice & NoticesSlice & RecipeSlice & ResultsSlice & ViewSlice & SettingsSlice & SessionSlice & CalibrationSlice & FitSlice & ReportSlice;

/** A fresh store (tests make one each). */
export const createAppStore = () => create<AppState>()((...a) => ({
  ...createInputsSlice(...a),
  ...createNoticesSlice(...a),
  ...createRecipeSlice(...a),
  ...createResultsSlice(...a),
  ...createViewSlice(...a),
  ...createSettingsSlice(...a),
  ...createSessionSlice(...a),
  ...createCalibrationSlice(...a),
  ...createFitSlice(...a),
  ...createReportSlice(...a),
}));

export const useApp = createAppStore();
