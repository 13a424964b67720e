package org.hullbound.report;

import java.time.Duration;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.hullbound.diagnostics.Autocorrelation;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.RankNormalization;
import org.hullbound.diagnostics.VariableSummary;

/**
 * Renders the HTML report of a fit: run header, warnings, the summary table and, per unknown, a
 * trace, a density, an autocorrelation and a rank plot, all in one self-contained file.
 *
 * <p>The page has inline CSS and inline SVG only: no scripts, fonts or links to fetch, so it opens
 * offline and archives as one file. It is also well-formed XML. Awkward draws (NaN, infinities,
 * constant chains, one chain, one draw) give a note in place of the plot that cannot be drawn;
 * rendering never throws for them. Methods: Silverman (1986) for densities, Vehtari, Gelman,
 * Simpson, Carpenter and Buerkner (2021) for rank plots, Heckbert (1990) for axis ticks.
 */
public final class HtmlReport {
  private static final DateTimeFormatter STARTED =
      DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm:ss", Locale.ROOT);

  private HtmlReport() {}

  /**
   * The complete report page.
   *
   * @throws IllegalArgumentException if {@code input} is null
   */
  public static String render(ReportInput input) {
    return render(input, PredictiveChecks.none());
  }

  /**
   * The complete report page with a section of posterior predictive checks after the summary.
   *
   * @throws IllegalArgumentException if an argument is null
   */
  public static String render(ReportInput input, PredictiveChecks checks) {
    return render(input, checks, ProbabilityTable.none());
  }

  /**
   * The complete report page with the user's probability statements and the posterior predictive
   * checks after the summary.
   *
   * @throws IllegalArgumentException if an argument is null
   */
  public static String render(
      ReportInput input, PredictiveChecks checks, ProbabilityTable probabilities) {
    if (input == null || checks == null || probabilities == null) {
      throw new IllegalArgumentException("input, checks and probabilities must not be null");
    }
    StringBuilder html = new StringBuilder(64 * 1024);
    String model =
        input.header().modelName().isBlank() ? "unnamed model" : input.header().modelName();
    html.append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"/>")
        .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>")
        .append("<title>hullbound report: ")
        .append(Markup.escape(model))
        .append("</title><style>")
        .append(Style.CSS)
        .append("</style></head>\n<body><main>\n");
    header(html, input, model);
    contents(html, input, checks, probabilities);
    warnings(html, input.warnings(), input.conclusion());
    sources(html, input.sources());
    table(html, input);
    probabilities.section(html);
    checks.section(html);
    IndexedIntervals.section(html, input);
    PairPlots.section(html, input);
    plots(html, input);
    footer(html, input.options());
    html.append("</main></body></html>\n");
    return html.toString();
  }

  private static void header(StringBuilder html, ReportInput input, String model) {
    RunHeader h = input.header();
    html.append("<header class=\"run\"><p class=\"kicker\">hullbound fit report</p><h1>")
        .append(Markup.escape(model))
        .append("</h1><dl class=\"facts\">");
    String offset =
        h.startedAt().getOffset().getTotalSeconds() == 0
            ? "UTC"
            : h.startedAt().getOffset().getId();
    fact(html, "started", h.startedAt().format(STARTED) + " " + offset);
    fact(html, "run time", duration(h.runTime()));
    fact(html, "chains", Integer.toString(h.chains()));
    fact(html, "draws per chain", h.drawsPerChain() + " kept");
    fact(html, "burn-in per chain", Integer.toString(h.burnIn()));
    fact(html, "seed", Long.toString(h.seed()));
    fact(html, "unknowns", Integer.toString(input.unknowns().size()));
    html.append("</dl></header>\n");
  }

  /** The table of contents: the page's sections, and each plotted unknown by name. */
  private static void contents(
      StringBuilder html, ReportInput input, PredictiveChecks checks,
      ProbabilityTable probabilities) {
    html.append("<nav class=\"contents\" id=\"contents\"><h2>On this page</h2><ol>")
        .append("<li><a href=\"#warnings\">Warnings</a></li>");
    if (!input.sources().isEmpty()) {
      html.append("<li><a href=\"#sources\">Model and data</a></li>");
    }
    html.append("<li><a href=\"#summary\">Summary</a></li>");
    if (probabilities.hasSection()) {
      html.append("<li><a href=\"#probabilities\">Probability statements</a></li>");
    }
    if (checks.hasSection()) {
      html.append("<li><a href=\"#predictive\">Posterior predictive checks</a></li>");
    }
    if (!IndexedIntervals.groups(input.unknowns()).isEmpty()) {
      html.append("<li><a href=\"#intervals\">Intervals of indexed unknowns</a></li>");
    }
    if (PairPlots.hasPairs(input)) {
      html.append("<li><a href=\"#pairs\">Most correlated pairs</a></li>");
    }
    int cap = Math.min(input.options().plotCap(), input.unknowns().size());
    if (cap > 0) {
      html.append("<li><a href=\"#plots\">Unknowns one by one</a><ol class=\"names\">");
      for (int i = 0; i < cap; i++) {
        html.append("<li><a href=\"#u")
            .append(i)
            .append("\">")
            .append(Markup.escape(input.unknowns().get(i).name()))
            .append("</a></li>");
      }
      html.append("</ol></li>");
    }
    html.append("</ol></nav>\n");
  }

  /** The model text as written and one line per data source: rows, missing cells imputed. */
  private static void sources(StringBuilder html, RunSources sources) {
    if (sources.isEmpty()) {
      return;
    }
    html.append("<section id=\"sources\"><h2>Model and data</h2>");
    if (!sources.data().isEmpty()) {
      html.append("<ul class=\"data\">");
      for (RunSources.DataSource d : sources.data()) {
        html.append("<li><span class=\"file\">")
            .append(Markup.escape(d.source()))
            .append("</span>: ")
            .append(d.rows())
            .append(d.rows() == 1 ? " row" : " rows")
            .append(", ")
            .append(
                d.missingCells() == 0
                    ? "no missing cells"
                    : d.missingCells()
                        + (d.missingCells() == 1 ? " missing cell" : " missing cells")
                        + " imputed (drawn as unknowns)")
            .append("</li>");
      }
      html.append("</ul>");
    } else {
      html.append("<p class=\"lead\">No data file was read.</p>");
    }
    if (!sources.modelText().isBlank()) {
      html.append("<pre class=\"model\">")
          .append(Markup.escape(sources.modelText().stripTrailing()))
          .append("</pre>");
    }
    html.append("</section>\n");
  }

  private static void fact(StringBuilder html, String term, String value) {
    html.append("<div><dt>")
        .append(Markup.escape(term))
        .append("</dt><dd>")
        .append(Markup.escape(value))
        .append("</dd></div>");
  }

  private static void warnings(StringBuilder html, List<String> warnings, String conclusion) {
    if (warnings.isEmpty()) {
      html.append("<section class=\"warnings none\" id=\"warnings\"><p>")
          .append(
              conclusion.isEmpty()
                  ? "No warnings were raised for this run."
                  : Markup.escape(conclusion))
          .append("</p></section>\n");
      return;
    }
    html.append("<section class=\"warnings\" id=\"warnings\"><h2>")
        .append(warnings.size() == 1 ? "1 warning" : warnings.size() + " warnings")
        .append("</h2><ul>");
    for (String w : warnings) {
      html.append("<li>").append(Markup.escape(w)).append("</li>");
    }
    html.append("</ul>");
    if (!conclusion.isEmpty()) {
      html.append("<p>").append(Markup.escape(conclusion)).append("</p>");
    }
    html.append("</section>\n");
  }

  private static void table(StringBuilder html, ReportInput input) {
    int cap = input.options().plotCap();
    html.append("<section id=\"summary\"><h2>Summary</h2>")
        .append("<p class=\"lead\">The estimate from all draws pooled: the mean with its Monte")
        .append(" Carlo standard error (MCSE), the sd and the central interval; the trust in")
        .append(" it: rank-normalised split R-hat, bulk-ESS and tail-ESS (Vehtari et al. 2021);")
        .append(" and what the draws cost. Marked values (&#9652;) have R-hat above ")
        .append(Markup.escape(Answers.plain(input.options().maxRhat())))
        .append(" or an effective sample size below ")
        .append(Markup.escape(Answers.plain(input.options().minEss())))
        .append("; n/a means not defined for these draws.</p>")
        .append("<div class=\"scroll\"><table><thead>")
        .append("<tr class=\"groups\"><th></th><th colspan=\"3\">estimate</th>")
        .append("<th colspan=\"3\">trust</th><th colspan=\"2\">cost</th></tr><tr>");
    String[] headings = {
      "unknown",
      "mean \u00b1 MCSE",
      "sd",
      CentralInterval.percent(input.options().intervalLevel()) + " interval",
      "R-hat",
      "bulk-ESS",
      "tail-ESS",
      "update",
      "evals per draw"
    };
    for (String heading : headings) {
      html.append(heading.equals("update") ? "<th class=\"text\">" : "<th>")
          .append(Markup.escape(heading))
          .append("</th>");
    }
    html.append("</tr></thead><tbody>");
    if (input.unknowns().isEmpty()) {
      html.append("<tr><td colspan=\"9\">This run has no unknowns.</td></tr>");
    }
    for (int i = 0; i < input.unknowns().size(); i++) {
      UnknownReport u = input.unknowns().get(i);
      VariableSummary s = u.summary();
      ReportOptions o = input.options();
      html.append("<tr><td class=\"name\">");
      if (i < cap) {
        html.append("<a href=\"#u").append(i).append("\">").append(Markup.escape(u.name()));
        html.append("</a>");
      } else {
        html.append(Markup.escape(u.name()));
      }
      html.append("</td>");
      cell(
          html,
          Double.isNaN(s.mean())
              ? NumberText.NOT_AVAILABLE
              : NumberText.significant(s.mean(), 4)
                  + (Double.isNaN(s.mcseMean())
                      ? ""
                      : " \u00b1 " + NumberText.significant(s.mcseMean(), 2)),
          false);
      cell(html, NumberText.significant(s.sd(), 4), false);
      CentralInterval interval = u.interval(o.intervalLevel());
      cell(
          html,
          Double.isNaN(interval.lower())
              ? NumberText.NOT_AVAILABLE
              : NumberText.significant(interval.lower(), 4)
                  + " .. "
                  + NumberText.significant(interval.upper(), 4),
          false);
      cell(html, NumberText.fixed(s.rhat(), 3), s.rhat() > o.maxRhat());
      cell(html, NumberText.count(s.essBulk()), s.essBulk() < o.minEss());
      cell(html, NumberText.count(s.essTail()), s.essTail() < o.minEss());
      html.append("<td class=\"text\">")
          .append(
              Markup.escape(u.update().map(UpdateFacts::update).orElse(NumberText.NOT_AVAILABLE)))
          .append("</td>");
      cell(html, u.update().map(HtmlReport::evaluations).orElse(NumberText.NOT_AVAILABLE), false);
      html.append("</tr>");
    }
    html.append("</tbody></table></div>");
    if (input.unknowns().size() > cap) {
      html.append("<p class=\"lead\">")
          .append(capSentence(input.unknowns().size(), cap))
          .append("</p>");
    }
    html.append("</section>\n");
  }

  private static void cell(StringBuilder html, String text, boolean flag) {
    if (text.equals(NumberText.NOT_AVAILABLE)) {
      html.append("<td class=\"undefined\">").append(text).append("</td>");
      return;
    }
    html.append(flag ? "<td class=\"flag\">" : "<td>").append(Markup.escape(text)).append("</td>");
  }

  /** Evaluations per draw as the terminal table writes them. */
  private static String evaluations(UpdateFacts facts) {
    double e = facts.evaluationsPerDraw();
    return e == 0 ? "0" : NumberText.significant(e, 3);
  }

  private static String capSentence(int total, int cap) {
    if (cap == 0) {
      return "No per-unknown plots are drawn: the plot cap is 0. All " + total + " unknowns are in the table.";
    }
    return "Plots are drawn for the first "
        + cap
        + " of "
        + total
        + " unknowns (the plot cap, a report option); the other "
        + (total - cap)
        + " appear in the table only.";
  }

  private static void plots(StringBuilder html, ReportInput input) {
    List<UnknownReport> unknowns = input.unknowns();
    int cap = Math.min(input.options().plotCap(), unknowns.size());
    if (unknowns.isEmpty()) {
      return;
    }
    html.append("<section id=\"plots\"><h2>Unknowns one by one</h2><p class=\"lead\">")
        .append("Each unknown answers four questions, the answer first and its plots under it. ")
        .append("Where is it: a kernel density per chain. Did the chains agree: a histogram per ")
        .append("chain of the ranks of its draws among all draws, and each chain&#8217;s mean. ")
        .append("How fast did it move: every chain&#8217;s trace and the autocorrelation ")
        .append("averaged over chains. What did it cost: the update and its density ")
        .append("evaluations. Colours and dash patterns are the chains&#8217;, as in the trace. ")
        .append("Shaded bands show what independent draws would give: for ranks the middle 95% ")
        .append("of a bin&#8217;s count, for autocorrelation &#177;1.96/&#8730;n. ")
        .append("Traces longer than ")
        .append(input.options().maxTracePoints())
        .append(" draws are thinned to that many points per chain, keeping the lowest and ")
        .append("highest draw of every stretch, so no spike is hidden.");
    if (unknowns.size() > cap) {
      html.append(' ').append(capSentence(unknowns.size(), input.options().plotCap()));
    }
    html.append("</p>\n");
    for (int i = 0; i < cap; i++) {
      unknownSection(html, i, unknowns.get(i), input.options());
    }
    html.append("</section>\n");
  }

  private static void unknownSection(
      StringBuilder html, int index, UnknownReport u, ReportOptions options) {
    VariableSummary s = u.summary();
    List<String> notes = new ArrayList<>(s.notes());
    String trace = tracePanel(u, options, notes);
    String density = densityPanel(u, options, notes);
    Optional<double[]> rho = autocorrelation(u.draws(), options);
    String acf = autocorrelationPanel(u, options, rho);
    String ranks = rankPanel(u, options);
    double[] chainMeans = Answers.chainMeans(u.draws());
    html.append("<section class=\"unknown\" id=\"u")
        .append(index)
        .append("\"><h3>")
        .append(Markup.escape(u.name()))
        .append("</h3>");
    if (!notes.isEmpty()) {
      html.append("<ul class=\"notes\">");
      for (String note : notes) {
        html.append("<li>").append(Markup.escape(note)).append("</li>");
      }
      html.append("</ul>");
    }
    html.append("<div class=\"questions\">");
    question(
        html, "where", "Where is it?",
        Answers.where(s, u.interval(options.intervalLevel())), density);
    question(
        html, "agree", "Did the chains agree?",
        Answers.agreement(s, chainMeans, options.maxRhat()), ranks + chainMeanList(chainMeans));
    question(
        html, "speed", "How fast did it move?",
        Answers.speed(s, rho, options.minEss()), "<div class=\"pair\">" + trace + acf + "</div>");
    question(html, "cost", "What did it cost?", Answers.cost(s, u.update()), "");
    html.append("</div></section>\n");
  }

  /** One labelled question block: heading, the answer in plain words, then its panels. */
  private static void question(
      StringBuilder html, String kind, String heading, String answer, String panels) {
    html.append("<div class=\"question q-")
        .append(kind)
        .append("\"><h4>")
        .append(heading)
        .append("</h4><p class=\"answer\">")
        .append(Markup.escape(answer))
        .append("</p>")
        .append(panels)
        .append("</div>");
  }

  /** Each chain's mean beside its colour swatch, so the agreement answer can be checked. */
  private static String chainMeanList(double[] means) {
    if (means.length < 2) {
      return "";
    }
    StringBuilder list = new StringBuilder("<ul class=\"chain-means\">");
    for (int c = 0; c < means.length; c++) {
      list.append("<li><span class=\"swatch\" style=\"background:")
          .append(Palette.colour(c))
          .append("\"></span>chain ")
          .append(c + 1)
          .append(" mean ")
          .append(
              Markup.escape(
                  Double.isNaN(means[c])
                      ? NumberText.NOT_AVAILABLE
                      : NumberText.significant(means[c], 4)))
          .append("</li>");
    }
    return list.append("</ul>").toString();
  }

  private static String tracePanel(UnknownReport u, ReportOptions options, List<String> notes) {
    Draws draws = u.draws();
    List<Series> series = new ArrayList<>();
    long nonFinite = 0;
    for (int c = 0; c < draws.chainCount(); c++) {
      double[] chain = draws.chain(c);
      for (double v : chain) {
        if (!Double.isFinite(v)) {
          nonFinite++;
        }
      }
      series.add(TraceDownsampler.minMax("chain " + (c + 1), chain, options.maxTracePoints()));
    }
    if (nonFinite > 0) {
      notes.add(
          nonFinite
              + " of "
              + draws.totalCount()
              + " draws are NaN or infinite; the plots leave them out (gaps in the trace).");
    }
    return SvgPlot.trace(new PanelLabels("trace", "trace", "draw after burn-in", ""), series);
  }

  private static String densityPanel(UnknownReport u, ReportOptions options, List<String> notes) {
    PanelLabels labels = new PanelLabels("density", "density per chain", u.name(), "");
    Draws draws = u.draws();
    KernelDensity[] perChain = new KernelDensity[draws.chainCount()];
    double low = Double.POSITIVE_INFINITY;
    double high = Double.NEGATIVE_INFINITY;
    double widest = 0;
    List<String> flat = new ArrayList<>();
    for (int c = 0; c < draws.chainCount(); c++) {
      double[] finite = finiteValues(draws.chain(c));
      try {
        perChain[c] = KernelDensity.of(finite);
        low = Math.min(low, perChain[c].min());
        high = Math.max(high, perChain[c].max());
        widest = Math.max(widest, perChain[c].bandwidth());
      } catch (IllegalArgumentException e) {
        flat.add(
            finite.length == 0
                ? "chain " + (c + 1) + " has no finite draws"
                : finite.length == 1
                    ? "chain "
                        + (c + 1)
                        + " has one finite draw, "
                        + NumberText.significant(finite[0], 4)
                    : "chain "
                        + (c + 1)
                        + " is constant at "
                        + NumberText.significant(finite[0], 4));
      }
    }
    if (flat.size() == draws.chainCount()) {
      if (draws.isConstant()) {
        return SvgPlot.note(
            labels,
            "no density: every draw equals " + NumberText.significant(draws.chain(0)[0], 6));
      }
      return SvgPlot.note(labels, "no density: " + String.join("; ", flat));
    }
    if (!flat.isEmpty()) {
      notes.add("No density is drawn for " + String.join("; ", flat) + ".");
    }
    // Clamped and interpolated as a weighted sum, so draws near the largest doubles cannot
    // overflow the grid; such a range then ends as a note from the plot itself.
    low = Math.max(-Double.MAX_VALUE, low - 3 * widest);
    high = Math.min(Double.MAX_VALUE, high + 3 * widest);
    int points = options.densityPoints();
    double[] grid = new double[points];
    for (int i = 0; i < points; i++) {
      double t = (double) i / (points - 1);
      grid[i] = (1 - t) * low + t * high;
    }
    List<Series> series = new ArrayList<>();
    for (int c = 0; c < perChain.length; c++) {
      String name = "chain " + (c + 1);
      series.add(
          perChain[c] == null
              ? new Series(name, new double[0], new double[0])
              : new Series(name, grid, perChain[c].density(grid)));
    }
    return SvgPlot.curves(labels, series, false);
  }

  /** The autocorrelation averaged over chains, when the draws allow it. */
  private static Optional<double[]> autocorrelation(Draws draws, ReportOptions options) {
    if (!draws.isFinite()
        || draws.length() < PosteriorSummary.MINIMUM_DRAWS_PER_CHAIN
        || everyChainConstant(draws)) {
      return Optional.empty();
    }
    return Optional.of(
        Autocorrelation.averaged(draws, Math.min(options.maxLag(), draws.length() - 1)));
  }

  private static String autocorrelationPanel(
      UnknownReport u, ReportOptions options, Optional<double[]> autocorrelation) {
    Draws draws = u.draws();
    String title = draws.chainCount() == 1 ? "autocorrelation" : "autocorrelation, mean of chains";
    PanelLabels labels = new PanelLabels("autocorrelation", title, "lag", "");
    if (!draws.isFinite()) {
      return SvgPlot.note(labels, "not drawn: some draws are NaN or infinite");
    }
    if (draws.length() < PosteriorSummary.MINIMUM_DRAWS_PER_CHAIN) {
      return SvgPlot.note(
          labels,
          "not drawn: needs "
              + PosteriorSummary.MINIMUM_DRAWS_PER_CHAIN
              + " draws per chain, has "
              + draws.length());
    }
    if (draws.isConstant()) {
      return SvgPlot.note(labels, "not drawn: every draw is the same");
    }
    if (autocorrelation.isEmpty()) {
      return SvgPlot.note(labels, "not drawn: every chain is constant");
    }
    double[] rho = autocorrelation.get();
    double[] lags = new double[rho.length];
    for (int t = 0; t < lags.length; t++) {
      lags[t] = t;
    }
    // White-noise band +-1.96/sqrt(n) for one independent chain (common practice).
    double half = 1.96 / Math.sqrt(draws.length());
    return SvgPlot.bars(labels, lags, rho, Optional.of(new ReferenceBand(-half, 0, half)));
  }

  private static String rankPanel(UnknownReport u, ReportOptions options) {
    Draws draws = u.draws();
    PanelLabels labels =
        new PanelLabels("ranks", "rank histogram per chain", "rank among all draws", "");
    if (draws.chainCount() == 1) {
      return SvgPlot.note(labels, "one chain: rank plots compare chains");
    }
    if (!draws.isFinite()) {
      return SvgPlot.note(labels, "not drawn: some draws are NaN or infinite");
    }
    if (draws.length() < 2) {
      return SvgPlot.note(labels, "not drawn: one draw per chain");
    }
    if (draws.isConstant()) {
      return SvgPlot.note(labels, "not drawn: every draw is the same");
    }
    int n = draws.length();
    long total = draws.totalCount();
    // At least about five draws per bin and chain, so that a flat histogram can be told from noise.
    int bins = Math.max(1, Math.min(options.rankBins(), n / 5));
    double[] ranks = RankNormalization.fractionalRanks(draws.pooled());
    double[] edges = new double[bins + 1];
    for (int b = 0; b <= bins; b++) {
      edges[b] = 0.5 + (double) b * total / bins;
    }
    List<double[]> counts = new ArrayList<>();
    List<String> names = new ArrayList<>();
    for (int c = 0; c < draws.chainCount(); c++) {
      double[] count = new double[bins];
      for (int i = 0; i < n; i++) {
        double r = ranks[c * n + i];
        int b = (int) Math.floor((r - 0.5) * bins / total);
        count[Math.max(0, Math.min(bins - 1, b))]++;
      }
      counts.add(count);
      names.add("chain " + (c + 1));
    }
    Optional<ReferenceBand> band = Optional.empty();
    if (bins > 1) {
      // Under perfect mixing a chain's count in a bin is hypergeometric; the binomial with
      // p = 1/bins is slightly wider, so the band errs on the side of fewer false alarms.
      BinomialDistribution binomial = new BinomialDistribution(null, n, 1.0 / bins);
      band =
          Optional.of(
              new ReferenceBand(
                  binomial.inverseCumulativeProbability(0.025),
                  (double) n / bins,
                  binomial.inverseCumulativeProbability(0.975)));
    }
    return SvgPlot.steps(labels, edges, counts, List.of(), band);
  }

  private static boolean everyChainConstant(Draws draws) {
    for (int c = 0; c < draws.chainCount(); c++) {
      double[] chain = draws.chain(c);
      for (double v : chain) {
        if (v != chain[0]) {
          return false;
        }
      }
    }
    return true;
  }

  private static double[] finiteValues(double[] chain) {
    int count = 0;
    for (double v : chain) {
      if (Double.isFinite(v)) {
        count++;
      }
    }
    double[] finite = new double[count];
    int k = 0;
    for (double v : chain) {
      if (Double.isFinite(v)) {
        finite[k++] = v;
      }
    }
    return finite;
  }

  static String duration(Duration d) {
    long millis = d.toMillis();
    if (millis < 60_000) {
      return String.format(Locale.ROOT, millis < 10_000 ? "%.2f s" : "%.1f s", millis / 1000.0);
    }
    long seconds = d.toSeconds();
    if (seconds < 3600) {
      return String.format(Locale.ROOT, "%d min %02d s", seconds / 60, seconds % 60);
    }
    return String.format(Locale.ROOT, "%d h %02d min", seconds / 3600, (seconds % 3600) / 60);
  }

  private static void footer(StringBuilder html, ReportOptions options) {
    html.append("<footer><p>Written by hullbound. Densities: Gaussian kernel, Silverman&#8217;s ")
        .append("rule-of-thumb bandwidth (Silverman 1986), per chain. Rank histograms: pooled ")
        .append("ranks split by chain (Vehtari et al. 2021). Traces keep at most ")
        .append(options.maxTracePoints())
        .append(" points per chain; autocorrelation to lag ")
        .append(options.maxLag())
        .append(". This file is self-contained and works offline.</p></footer>\n");
  }

  /** The page's style sheet: our own calm palette, print and narrow-window rules. */
  private static final class Style {
    static final String CSS =
        """
        :root{--ink:#1e2329;--muted:#5d6670;--rule:#d9d6cf;--paper:#fcfbf8;--card:#ffffff;
          --accent:#332288;--warn:#9a540f;--warn-bg:#fbf1e1;--ok:#3f7a5c;--ok-bg:#edf4ef}
        *{box-sizing:border-box}
        body{margin:0;background:var(--paper);color:var(--ink);
          font:15px/1.5 system-ui,-apple-system,'Segoe UI',Roboto,'Helvetica Neue',Arial,sans-serif}
        main{max-width:1200px;margin:0 auto;padding:24px 20px 48px}
        a{color:var(--accent)}
        header.run{border-bottom:2px solid var(--ink);padding-bottom:14px;margin-bottom:18px}
        .kicker{text-transform:uppercase;letter-spacing:.09em;font-size:12px;color:var(--muted);
          margin:0}
        h1{font-size:26px;margin:2px 0 12px;font-weight:650;overflow-wrap:anywhere}
        dl.facts{display:grid;grid-template-columns:repeat(auto-fill,minmax(120px,1fr));
          gap:8px 18px;margin:0}
        dl.facts div{border-left:3px solid var(--rule);padding-left:9px}
        dl.facts div:first-child{grid-column:span 2}
        dl.facts dt{font-size:12px;color:var(--muted)}
        dl.facts div{min-width:0}
        dl.facts dd{margin:0;font-variant-numeric:tabular-nums;overflow-wrap:anywhere}
        section.warnings{background:var(--warn-bg);border-left:4px solid var(--warn);
          padding:8px 16px;margin:0 0 20px}
        section.warnings h2{margin:4px 0;font-size:16px;color:var(--warn)}
        section.warnings ul{margin:4px 0 6px;padding-left:20px}
        section.warnings.none{background:var(--ok-bg);border-left-color:var(--ok)}
        section.warnings p{margin:4px 0}
        h2{font-size:19px;margin:26px 0 6px}
        .lead{color:var(--muted);font-size:13.5px;margin:0 0 10px;max-width:70em}
        .scroll{overflow-x:auto}
        table{border-collapse:collapse;font-variant-numeric:tabular-nums;font-size:13.5px;
          min-width:100%}
        th,td{padding:4px 10px;text-align:right;white-space:nowrap;
          border-bottom:1px solid var(--rule)}
        th{font-weight:600;font-size:12.5px;color:var(--muted);border-bottom:1.5px solid var(--ink)}
        th:first-child,td.name,td.statement,.text{text-align:left}
        table.probabilities{min-width:0}
        tr.groups th{text-align:center;text-transform:uppercase;letter-spacing:.08em;
          font-size:11px;border-bottom:1px solid var(--rule)}
        tr.groups th+th{border-left:2px solid var(--rule)}
        td.name{font-family:ui-monospace,'SF Mono',Menlo,Consolas,monospace;font-size:13px}
        tbody tr:nth-child(even){background:#f4f2ec}
        td.flag{color:var(--warn);font-weight:650}
        td.flag::after{content:'\\2009\\25B4'}
        td.undefined{color:var(--muted)}
        section.unknown{background:var(--card);border:1px solid var(--rule);border-radius:4px;
          padding:12px 14px 10px;margin:14px 0;break-inside:avoid}
        section.unknown h3{margin:0;font-size:16px;overflow-wrap:anywhere;
          font-family:ui-monospace,'SF Mono',Menlo,Consolas,monospace}
        .keyline{color:var(--muted);font-size:13px;margin:0 0 6px}
        ul.notes{font-size:13px;color:var(--warn);margin:2px 0 8px;padding-left:20px}
        .questions{display:grid;grid-template-columns:1fr 1fr;gap:10px 22px}
        .question{min-width:0;border-top:2px solid var(--rule);padding-top:4px}
        .question h4{margin:0;font-size:12px;text-transform:uppercase;letter-spacing:.07em;
          color:var(--accent)}
        .answer{margin:2px 0 6px;font-size:13.5px}
        .q-speed{grid-column:1/-1}
        .q-cost{grid-column:1/-1}
        .pair{display:grid;grid-template-columns:repeat(auto-fit,minmax(260px,1fr));gap:8px 16px}
        .question svg,.pairs svg{width:100%;height:auto;display:block}
        ul.chain-means{list-style:none;padding:0;margin:4px 0 0;font-size:12.5px;
          display:flex;flex-wrap:wrap;gap:2px 14px;font-variant-numeric:tabular-nums}
        .swatch{display:inline-block;width:10px;height:10px;margin-right:5px;border-radius:2px}
        nav.contents{font-size:13.5px;border:1px solid var(--rule);padding:4px 14px;
          margin:0 0 18px;background:var(--card)}
        nav.contents h2{font-size:13px;margin:6px 0 2px;text-transform:uppercase;
          letter-spacing:.07em;color:var(--muted)}
        nav.contents ol{margin:2px 0 6px;padding-left:22px}
        nav.contents ol.names{display:flex;flex-wrap:wrap;gap:0 14px;list-style:none;
          padding-left:0;font-family:ui-monospace,'SF Mono',Menlo,Consolas,monospace;
          font-size:12.5px;max-height:8.5em;overflow-y:auto}
        pre.model{background:var(--card);border:1px solid var(--rule);padding:8px 12px;
          font-size:13px;overflow-x:auto;max-height:24em}
        ul.data{font-size:13.5px;margin:4px 0 8px}
        span.file{font-family:ui-monospace,'SF Mono',Menlo,Consolas,monospace}
        .interval-plot{margin:10px 0 18px}
        .interval-plot h3{font-size:15px;margin:0;font-family:ui-monospace,'SF Mono',Menlo,
          Consolas,monospace}
        .interval-plot svg{width:100%;height:auto;display:block;max-width:760px}
        .interval-plot .by-mean{display:none}
        .interval-plot input:checked~.by-mean{display:block}
        .interval-plot input:checked~.by-index{display:none}
        .interval-plot label{font-size:13px;color:var(--muted)}
        .pairs{display:grid;grid-template-columns:repeat(auto-fit,minmax(260px,1fr));
          gap:10px 16px}
        .pairs figure{margin:0;min-width:0}
        .pairs figcaption{font-size:13px}
        footer{margin-top:30px;border-top:1px solid var(--rule);padding-top:8px;font-size:12.5px;
          color:var(--muted)}
        @media (max-width:720px){.questions{grid-template-columns:1fr}}
        @media (max-width:560px){main{padding:14px 10px 32px}h1{font-size:21px}
          section.unknown{padding:10px 8px}}
        @media print{body{background:#fff;font-size:10.5pt}main{max-width:none;padding:0}
          tbody tr:nth-child(even){background:none}section.unknown{border-color:#bbb}
          .questions{grid-template-columns:repeat(2,1fr)}a{color:inherit;text-decoration:none}
          nav.contents{display:none}.interval-plot input,.interval-plot label{display:none}}
        """;
  }
}
