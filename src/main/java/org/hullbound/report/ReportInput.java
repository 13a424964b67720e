package org.hullbound.report;

import java.util.ArrayList;
import java.util.List;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.VariableSummary;

/**
 * All a report is made from: the run's header, the warnings in plain words and a closing line, one
 * entry per unknown in table order, and the drawing options.
 *
 * <p>The warnings are sentences such as the {@link Verdict} texts of {@link Verdicts}; the report
 * shows them first, as given, and the conclusion under them (e.g. "All 6 unknowns look converged
 * ..."). {@link #of(RunHeader, SummaryTable, Verdicts, List, ReportOptions)} builds the whole input
 * from the objects the terminal summary is made of.
 *
 * @param header the facts of the run
 * @param warnings plain-language warnings, possibly none
 * @param conclusion one closing sentence, possibly empty
 * @param unknowns the unknowns, in the order of the table
 * @param options what to draw and mark
 * @param sources the model text and data the run was fitted from, shown at the top
 */
public record ReportInput(
    RunHeader header,
    List<String> warnings,
    String conclusion,
    List<UnknownReport> unknowns,
    ReportOptions options,
    RunSources sources) {

  /** Checks that nothing is null and copies the lists. */
  public ReportInput {
    if (header == null || options == null || sources == null) {
      throw new IllegalArgumentException("header, options and sources must not be null");
    }
    if (warnings == null || unknowns == null) {
      throw new IllegalArgumentException("warnings and unknowns must not be null (may be empty)");
    }
    if (warnings.stream().anyMatch(w -> w == null) || unknowns.stream().anyMatch(u -> u == null)) {
      throw new IllegalArgumentException("warnings and unknowns must not hold null");
    }
    conclusion = conclusion == null ? "" : conclusion;
    warnings = List.copyOf(warnings);
    unknowns = List.copyOf(unknowns);
  }

  /** An input with no model text or data facts ({@link RunSources#unknown()}). */
  public ReportInput(
      RunHeader header,
      List<String> warnings,
      String conclusion,
      List<UnknownReport> unknowns,
      ReportOptions options) {
    this(header, warnings, conclusion, unknowns, options, RunSources.unknown());
  }

  /** This input with the model text and data facts given. */
  public ReportInput withSources(RunSources given) {
    return new ReportInput(header, warnings, conclusion, unknowns, options, given);
  }

  /**
   * The input for a report of the same run as {@code table}: its verdict texts as warnings, the
   * verdicts' closing line as the conclusion, and {@code draws.get(k)} as the draws of the table's
   * k-th unknown.
   *
   * @throws IllegalArgumentException if an argument is null, or the draws do not match the table in
   *     number or shape
   */
  public static ReportInput of(
      RunHeader header,
      SummaryTable table,
      Verdicts verdicts,
      List<Draws> draws,
      ReportOptions options) {
    if (table == null || verdicts == null || draws == null) {
      throw new IllegalArgumentException("table, verdicts and draws must not be null");
    }
    List<VariableSummary> summaries = table.summaries();
    if (draws.size() != summaries.size()) {
      throw new IllegalArgumentException(
          "draws must hold one entry per unknown of the table ("
              + summaries.size()
              + "), got "
              + draws.size());
    }
    List<UnknownReport> unknowns = new ArrayList<>();
    for (int k = 0; k < summaries.size(); k++) {
      VariableSummary s = summaries.get(k);
      unknowns.add(UnknownReport.of(s, draws.get(k), table.updates().get(s.name())));
    }
    List<String> warnings = new ArrayList<>();
    for (Verdict v : verdicts.verdicts()) {
      warnings.add(v.text());
    }
    List<String> lines = verdicts.lines();
    String conclusion = lines.isEmpty() ? "" : lines.get(lines.size() - 1);
    return new ReportInput(header, warnings, conclusion, unknowns, options);
  }
}
