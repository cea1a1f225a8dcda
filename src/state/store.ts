/**
 * One store in slices: inputs (traces and roles), recipe (the step stack
 * with undo/redo), results (what the worker computed), view (zoom and
 * display choices), session (how the session is being kept). The store
 * holds data only, never a Worker or a plot.
 */
import { create } from 'zustand';
import { createAnalysisSlice, type AnalysisSlice } from './analysis-slice.ts';
import { createCalibrationSlice, type CalibrationSlice } from './calibration-slice.ts';
import { createFitSlice, type FitSlice } from './fit-slice.ts';
import { createInputsSlice, type InputsSlice } from './inputs-slice.ts';
import { createRecipeSlice, type RecipeSlice } from './recipe-slice.ts';
import { createReportSlice, type ReportSlice } from './report-slice.ts';
import { createResultsSlice, type ResultsSlice } from './results-slice.ts';
import { createSessionSlice, type SessionSlice } from './session-slice.ts';
import { createViewSlice, type ViewSlice } from './view-slice.ts';

export type AppState = InputsSlice & RecipeSlice & ResultsSlice & ViewSlice & AnalysisSlice & SessionSlice & CalibrationSlice & FitSlice & ReportSlice;

/** A fresh store (tests make one each). */
export const createAppStore = () => create<AppState>()((...a) => ({
  ...createInputsSlice(...a),
  ...createRecipeSlice(...a),
  ...createResultsSlice(...a),
  ...createViewSlice(...a),
  ...createAnalysisSlice(...a),
  ...createSessionSlice(...a),
  ...createCalibrationSlice(...a),
  ...createFitSlice(...a),
  ...createReportSlice(...a),
}));

export const useApp = createAppStore();
