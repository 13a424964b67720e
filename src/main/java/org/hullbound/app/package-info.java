/**
 * The application layer: one home for the steps of a run, shared by every command that fits.
 *
 * <p>{@link org.hullbound.app.FitRun} reads the model and its data, builds the sampler, takes the
 * output folder ({@link org.hullbound.app.FolderLock}), runs the chains, stores the draws,
 * summarises them, decides the verdicts and writes the files; {@link
 * org.hullbound.app.InMemoryFit} is the same fit with the draws kept in memory only, for
 * validation and calibration. Nothing here prints or exits: results are values and failures are
 * typed exceptions ({@link org.hullbound.app.RunRefusedException}, {@link
 * org.hullbound.app.SamplingFailedException}), which the command line turns into messages and
 * exit codes in one place.
 */
package org.hullbound.app;
