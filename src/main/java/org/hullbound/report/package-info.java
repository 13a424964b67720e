/**
 * Human- and machine-readable reports of a run: the summary table (terminal text and CSV) and
 * plain-language verdicts on convergence and on the updaters used.
 *
 * <p>Uses only {@code org.hullbound.diagnostics}: the CLI builds {@link
 * org.hullbound.diagnostics.VariableSummary} values and the {@link
 * org.hullbound.report.UpdateFacts} of each unknown, and writes what this package renders. Nothing
 * here prints or touches files.
 */
package org.hullbound.report;
