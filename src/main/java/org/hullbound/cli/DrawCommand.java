package org.hullbound.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.util.Arrays;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.hullbound.hull.AdaptiveRejectionSampler;
import org.hullbound.hull.DifferentiableLogDensity;
import org.hullbound.hull.Evaluation;
import org.hullbound.hull.HullException;
import org.hullbound.hull.HullSnapshot;
import org.hullbound.hull.InvalidDensityException;
import org.hullbound.hull.NonIntegrableHullException;
import org.hullbound.hull.NotLogConcaveException;
import org.hullbound.hull.SamplerStatistics;
import org.hullbound.hull.Support;
import org.hullbound.io.AtomicFiles;
import org.hullbound.io.AtomicOutputFile;
import org.hullbound.lang.NumberSyntax;
import org.hullbound.model.UnivariateExpression;
import org.hullbound.report.EnvelopePlot;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code hullbound draw --log-density EXPR}: exact independent draws from the density exp(EXPR)
 * in x by adaptive rejection sampling, with the sampler's counters on standard error and, on
 * request, a picture of the final hull, squeeze and log-density.
 *
 * <p>Thin by design: {@link UnivariateExpression} compiles the expression with its derivative,
 * the {@code hull} package samples (Gilks and Wild 1992), {@link EnvelopePlot} draws; this class
 * reads the options, streams the draws, and turns failures into exit codes (0 done, 1 a density
 * that adaptive rejection cannot sample, 2 a bad expression or option).
 */
@Command(
    name = "draw",
    mixinStandardHelpOptions = true,
    sortOptions = false,
    description =
        "Draw exactly from a log-concave density of one variable x, given as its "
        + "log-density in the model language, by adaptive rejection sampling. Draws go to "
        + "standard output (or --out FILE), one per line under the header x; the sampler's "
        + "counters go to standard error.")
public final class DrawCommand implements Callable<Integer> {
  /** The name under which the expression appears in messages. */
  static final String EXPRESSION_NAME = "<--log-density>";

  private static final int RUG_DRAWS = 1000;
  private static final int GRID_POINTS = 400;

  @Option(
      names = "--log-density",
      required = true,
      paramLabel = "EXPR",
      description =
        "The log-density in x up to a constant, e.g. \"-x^2/2 - 3*log1p(exp(-x))\"; the "
        + "functions of the model language may be used.")
  String logDensity;

  @Option(
      names = "--lower",
      paramLabel = "A",
      description = "Lower end of the support: a number or -inf (default: -inf).")
  String lower = "-inf";

  @Option(
      names = "--upper",
      paramLabel = "B",
      description = "Upper end of the support: a number or inf (default: inf).")
  String upper = "inf";

  @Option(
      names = {"-n", "--draws"},
      paramLabel = "N",
      description = "Number of draws (default: ${DEFAULT-VALUE}).")
  long count = 1000;

  @Option(
      names = "--seed",
      paramLabel = "S",
      description =
          "Seed of the generator; the same seed gives the same draws (default: drawn, and "
          + "printed).")
  Long seed;

  @Option(
      names = "--out",
      paramLabel = "FILE",
      description =
          "Write the draws to FILE (put in place when complete) instead of standard output.")
  Path out;

  @Option(
      names = "--plot",
      paramLabel = "FILE.svg",
      description =
          "Also draw the final hull, squeeze, log-density and the draws as an SVG picture.")
  Path plot;

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  @Override
  public Integer call() throws IOException {
    PrintWriter stdout = spec.commandLine().getOut();
    PrintWriter stderr = spec.commandLine().getErr();
    if (count < 1) {
      return fail(stderr, ErrorReporting.USER_ERROR, "-n must be at least 1, got " + count, null);
    }
    double a;
    double b;
    try {
      a = bound("--lower", lower);
      b = bound("--upper", upper);
    } catch (IllegalArgumentException bad) {
      traceUnderDebug(bad, stderr);
      return fail(stderr, ErrorReporting.USER_ERROR, bad.getMessage(), null);
    }
    if (a == Double.POSITIVE_INFINITY) {
      return fail(stderr, ErrorReporting.USER_ERROR, "--lower must be below inf, got " + lower,
          null);
    }
    if (b == Double.NEGATIVE_INFINITY) {
      return fail(stderr, ErrorReporting.USER_ERROR, "--upper must be above -inf, got " + upper,
          null);
    }
    if (!(a < b)) {
      return fail(stderr, ErrorReporting.USER_ERROR,
          "--lower must be below --upper, got --lower " + lower + " and --upper " + upper, null);
    }
    Support support = new Support(a, b);
    UnivariateExpression expression = UnivariateExpression.parse(EXPRESSION_NAME, logDensity);
    DifferentiableLogDensity density =
        x -> {
          UnivariateExpression.ValueAndSlope at = expression.evaluate(x);
          return new Evaluation(at.value(), at.slope());
        };
    long runSeed = seed != null ? seed : new SecureRandom().nextLong();
    RandomGenerator rng = RandomGeneratorFactory.of("L64X128MixRandom").create(runSeed);

    AdaptiveRejectionSampler sampler;
    try {
      sampler = AdaptiveRejectionSampler.withDerivatives(density, support);
    } catch (HullException failure) {
      traceUnderDebug(failure, stderr);
      return samplingFailed(stderr, failure, 0, out);
    } catch (IllegalArgumentException cannotStart) {
      traceUnderDebug(cannotStart, stderr);
      return fail(stderr, ErrorReporting.USER_ERROR, cannotStart.getMessage(), null);
    }
    long startEvaluations = sampler.statistics().evaluations();

    double[] rug = new double[(int) Math.min(count, RUG_DRAWS)];
    double smallest = Double.POSITIVE_INFINITY;
    double largest = Double.NEGATIVE_INFINITY;
    long made = 0;
    AtomicOutputFile file = out == null ? null : AtomicOutputFile.create(out);
    try {
      Writer writer = file == null ? stdout : file.writer();
      writer.write("x\n");
      for (; made < count; made++) {
        double x = sampler.sample(rng);
        writer.write(Double.toString(x));
        writer.write('\n');
        if (made < rug.length) {
          rug[(int) made] = x;
        }
        smallest = Math.min(smallest, x);
        largest = Math.max(largest, x);
      }
      writer.flush();
      if (file != null) {
        file.commit();
      }
    } catch (HullException failure) {
      stdout.flush();
      traceUnderDebug(failure, stderr);
      return samplingFailed(stderr, failure, made, out);
    } catch (IOException e) {
      throw new UncheckedIOException("cannot write " + (out == null ? "the draws" : out) + ": "
          + e.getMessage(), e);
    } finally {
      if (file != null) {
        file.close();
      }
    }

    SamplerStatistics statistics = sampler.statistics();
    stderr.print(statisticsText(statistics, startEvaluations, runSeed, support));
    if (out != null) {
      stderr.println("draws: " + out);
    }
    if (plot != null) {
      HullSnapshot snapshot = sampler.snapshot();
      AtomicFiles.write(plot, picture(expression, snapshot, support, smallest, largest, rug, made));
      stderr.println("plot:  " + plot);
    }
    stderr.flush();
    return 0;
  }

  /** A bound as typed: a number of the model language, inf or -inf. */
  static double bound(String option, String text) {
    try {
      return NumberSyntax.parse(text.strip());
    } catch (NumberSyntax.InvalidNumberException e) {
      throw new IllegalArgumentException(
          option + " must be a number, inf or -inf: " + e.getMessage());
    }
  }

  /** Under {@code --debug}, the stack trace of a failure this command reports itself. */
  private void traceUnderDebug(Exception failure, PrintWriter stderr) {
    stderr.flush();
    ErrorReporting.traceUnderDebug(spec.commandLine(), failure);
  }

  /**
   * The sampler's own message with its numbers as the model language writes them ({@code 1},
   * {@code 6e-8}, {@code -inf}) rather than as Java prints doubles ({@code 1.0}, {@code
   * 6.000000022204461E-8}, {@code -Infinity}).
   */
  static String languageNumbers(String message) {
    Matcher m = JAVA_DOUBLE.matcher(message);
    StringBuilder text = new StringBuilder();
    while (m.find()) {
      m.appendReplacement(text, Matcher.quoteReplacement(
          NumberSyntax.written(Double.parseDouble(m.group()))));
    }
    m.appendTail(text);
    return text.toString();
  }

  /** A double as {@link Double#toString} writes it: always a point, or an infinity. */
  private static final Pattern JAVA_DOUBLE =
      Pattern.compile("(?<![\\w.])-?(?:\\d+\\.\\d+(?:E-?\\d+)?|Infinity)(?![\\w.])");

  private static int fail(PrintWriter stderr, int status, String problem, String hint) {
    stderr.println("hullbound draw: " + problem);
    if (hint != null) {
      stderr.println("  = " + hint);
    }
    stderr.flush();
    return status;
  }

  private static int samplingFailed(
      PrintWriter stderr, HullException failure, long made, Path out) {
    String after = made == 0 ? "" : " (after " + made + " draw" + (made == 1 ? "" : "s") + ")";
    String where = Double.isNaN(failure.x()) ? "" : " at x = " + NumberSyntax.written(failure.x());
    String detail =
        languageNumbers(failure.getMessage().replaceFirst("^h is not log-concave: ", ""));
    String problem;
    String hint;
    if (failure instanceof NotLogConcaveException) {
      problem = "the density is not log-concave" + where + after + ": " + detail;
      hint = "adaptive rejection sampling is exact only for log-concave densities; this density"
          + " needs another sampler";
    } else if (failure instanceof NonIntegrableHullException) {
      problem = "the density cannot be normalised" + where + after + ": " + detail;
      hint = "exp(EXPR) must have a finite integral; give --lower or --upper where it does not"
          + " fall away";
    } else if (failure instanceof InvalidDensityException) {
      problem = "the log-density has no usable value" + where + after + ": " + detail;
      hint = "the expression must be defined on the whole support; check --lower and --upper";
    } else {
      problem = languageNumbers(failure.getMessage());
      hint = null;
    }
    if (out != null) {
      problem += "; " + out + " was not written";
    }
    return fail(stderr, ErrorReporting.FAILURE, problem, hint);
  }

  static String statisticsText(
      SamplerStatistics s, long startEvaluations, long seed, Support support) {
    StringBuilder text = new StringBuilder();
    text.append("hullbound draw: ").append(s.draws()).append(" draw")
        .append(s.draws() == 1 ? "" : "s").append(" on ").append(support).append(", seed ")
        .append(seed).append(" (give --seed ").append(seed).append(" to repeat them)\n");
    // Every proposal ends in one of four ways; only the two judged by the density cost an
    // evaluation, so the evaluations are the starting hull's plus those two (plus any others the
    // sampler made, shown when there are some).
    long densityRejections = s.rejections() - s.hullRejections();
    long judged = s.densityAcceptances() + densityRejections;
    long other = s.evaluations() - startEvaluations - judged;
    row(text, "proposals", s.proposals() + "  (" + percent(s.draws(), s.proposals())
        + " accepted; the four lines below add up to it)");
    row(text, "  accepted by squeeze", s.squeezeAcceptances() + "  ("
        + percent(s.squeezeAcceptances(), s.proposals()) + ", no evaluation)");
    row(text, "  rejected by hull", s.hullRejections() + "  ("
        + percent(s.hullRejections(), s.proposals()) + ", no evaluation)");
    row(text, "  accepted by density", s.densityAcceptances() + "  ("
        + percent(s.densityAcceptances(), s.proposals()) + ", one evaluation each)");
    row(text, "  rejected by density", densityRejections + "  ("
        + percent(densityRejections, s.proposals()) + ", one evaluation each)");
    row(text, "density evaluations", s.evaluations() + "  (" + startEvaluations
        + " for the starting hull + " + judged + " judged by density"
        + (other == 0 ? "" : " + " + other + " more") + "; "
        + fixed(s.evaluationsPerDraw(), 4) + " per draw)");
    row(text, "hull size", s.hullSize() + " abscissae");
    return text.toString();
  }

  private static void row(StringBuilder text, String label, String value) {
    text.append("  ").append(label).append(" ".repeat(Math.max(1, 24 - label.length())))
        .append(value).append('\n');
  }

  private static String percent(long part, long whole) {
    return whole == 0 ? "n/a" : String.format(Locale.ROOT, "%.1f%%", 100.0 * part / whole);
  }

  private static String fixed(double x, int decimals) {
    return Double.isNaN(x) ? "n/a" : String.format(Locale.ROOT, "%." + decimals + "f", x);
  }

  /** The SVG of the final envelope over the range of the draws (clipped to the support). */
  private static String picture(
      UnivariateExpression expression, HullSnapshot snapshot, Support support, double smallest,
      double largest, double[] rug, long made) {
    double width = largest - smallest;
    if (!(width > 0)) {
      width = Math.max(1e-3 * Math.abs(smallest), 1.0);
    }
    double low = Math.max(support.lower(), smallest - 0.08 * width);
    double high = Math.min(support.upper(), largest + 0.08 * width);
    if (!(low < high)) {
      low = smallest - width;
      high = smallest + width;
    }
    double[] gridX = new double[GRID_POINTS];
    double[] gridY = new double[GRID_POINTS];
    for (int i = 0; i < GRID_POINTS; i++) {
      gridX[i] = low + (high - low) * i / (GRID_POINTS - 1);
      gridY[i] = expression.value(gridX[i]);
    }
    double[] breaks = new double[snapshot.segmentCount() + 1];
    int k = 0;
    breaks[k++] = low;
    for (int j = 0; j < snapshot.segmentCount(); j++) {
      double z = snapshot.segmentUpper(j);
      if (z > low && z < high) {
        breaks[k++] = z;
      }
    }
    double[] hullX = Arrays.copyOf(breaks, k + 1);
    hullX[k] = high;
    double[] hullY = new double[hullX.length];
    for (int i = 0; i < hullX.length; i++) {
      hullY[i] = snapshot.logHull(hullX[i]);
    }
    double[] abscissae = snapshot.abscissae();
    double[] values = snapshot.logDensityValues();
    double[] squeezeX = new double[abscissae.length];
    double[] squeezeY = new double[abscissae.length];
    for (int i = 0; i < abscissae.length; i++) {
      squeezeX[i] = abscissae[i];
      squeezeY[i] = values[i];
    }
    return EnvelopePlot.svg(
        "exp(" + expression.text() + ") on " + support,
        low,
        high,
        new EnvelopePlot.Curve(hullX, hullY),
        new EnvelopePlot.Curve(squeezeX, squeezeY),
        new EnvelopePlot.Curve(gridX, gridY),
        new EnvelopePlot.Curve(abscissae, values),
        rug,
        made);
  }
}
