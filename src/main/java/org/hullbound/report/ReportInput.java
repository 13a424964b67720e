package org.hullbound.report;

import java.util.List;

/**
 * All a report is made from: the run's header, the warnings in plain words, one entry per unknown
 * in table order, and the drawing options.
 *
 * <p>The warnings are sentences such as the verdict lines of the terminal summary; the report
 * shows them first, as given.
 *
 * @param header the facts of the run
 * @param warnings plain-language warnings, possibly none
 * @param unknowns the unknowns, in the order of the table
 * @param options what to draw
 */
public record ReportInput(
    RunHeader header, List<String> warnings, List<UnknownReport> unknowns, ReportOptions options) {

  /** Checks that nothing is null and copies the lists. */
  public ReportInput {
    if (header == null || options == null) {
      throw new IllegalArgumentException("header and options must not be null");
    }
    if (warnings == null || unknowns == null) {
      throw new IllegalArgumentException("warnings and unknowns must not be null (may be empty)");
    }
    warnings = List.copyOf(warnings);
    unknowns = List.copyOf(unknowns);
  }
}
