package org.hullbound.model;

/**
 * What an empty cell in a modelled data column means: a missing observation to impute, or a
 * fault. An empty cell is easily left by accident (a spreadsheet's blank), so a user who knows the
 * data is complete can have binding refuse it; a cell written {@code NA} is always a missing
 * observation, marked on purpose.
 */
public enum EmptyCells {
  /** An empty cell is a missing observation, imputed by the sampler (the default). */
  IMPUTED,
  /** An empty cell is an error at its file, line and column. */
  REFUSED
}
