package org.hullbound.report;

import java.util.List;

/**
 * The probability statements a user asked for ({@code --probability "effect[3] > 0"}), as a small
 * table in the report after the summary: each statement, the share of draws that satisfy it and
 * that share's MCSE.
 *
 * <p>Why in the report: "how likely is it that the effect is positive" is often the question the
 * fit was made for, so it belongs beside the intervals that answer "where is it". The estimates
 * themselves are computed elsewhere ({@code diagnostics.TailShare}: the mean of an indicator, its
 * MCSE from the indicator's ESS, Vehtari et al. 2021); this class only lays them out.
 */
public final class ProbabilityTable {
  /**
   * One statement: as written ({@code effect[3] > 0}), its estimated probability and that
   * estimate's MCSE (NaN when every draw fell on one side, so no ESS exists).
   */
  public record Row(String statement, double probability, double mcse) {
    /** @throws IllegalArgumentException if {@code statement} is null */
    public Row {
      if (statement == null) {
        throw new IllegalArgumentException("statement must not be null");
      }
    }
  }

  private static final ProbabilityTable NONE = new ProbabilityTable(List.of());

  private final List<Row> rows;

  private ProbabilityTable(List<Row> rows) {
    this.rows = rows;
  }

  /** No statements: the report has no such section. */
  public static ProbabilityTable none() {
    return NONE;
  }

  /**
   * A table of {@code rows}, in the order given.
   *
   * @throws IllegalArgumentException if {@code rows} is null or holds null
   */
  public static ProbabilityTable of(List<Row> rows) {
    // not rows.contains(null): an immutable list throws on a null query
    if (rows == null || rows.stream().anyMatch(java.util.Objects::isNull)) {
      throw new IllegalArgumentException("rows must not be null or hold null");
    }
    return rows.isEmpty() ? NONE : new ProbabilityTable(List.copyOf(rows));
  }

  /** The statements, in order. */
  public List<Row> rows() {
    return rows;
  }

  /** Whether the report shows a section for them. */
  boolean hasSection() {
    return !rows.isEmpty();
  }

  void section(StringBuilder html) {
    if (rows.isEmpty()) {
      return;
    }
    html.append("<section id=\"probabilities\"><h2>Probability statements</h2><p class=\"lead\">")
        .append("The share of all kept draws for which each statement holds, with its Monte Carlo")
        .append(" standard error (from the effective sample size of the 0/1 indicator). Where")
        .append(" every draw falls on one side the error cannot be estimated: more draws, or a")
        .append(" statement nearer the bulk, tell more.</p>")
        .append("<table class=\"probabilities\"><thead><tr><th>statement</th><th>probability</th>")
        .append("<th>mcse</th></tr></thead><tbody>");
    for (Row r : rows) {
      html.append("<tr><td class=\"statement\">").append(Markup.escape(r.statement()))
          .append("</td><td>").append(NumberText.fixed(r.probability(), 4)).append("</td><td>")
          .append(Double.isNaN(r.mcse()) ? "n/a" : NumberText.fixed(r.mcse(), 4))
          .append("</td></tr>");
    }
    html.append("</tbody></table></section>\n");
  }
}
