package org.hullbound.validation;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.hullbound.app.InMemoryFit;
import org.hullbound.app.ModelInputs;
import org.hullbound.gibbs.RunSettings;
import org.hullbound.gibbs.UpdateReport;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.NameSuggestion;
import org.hullbound.model.BoundModel;
import org.hullbound.report.UpdateFacts;

/**
 * Runs the validation suite: fits each case's model with the Gibbs driver at a fixed seed and
 * compares posterior means and sds with references from published closed forms or from
 * quadrature of the model written independently ({@link QuadratureReferences}).
 *
 * <p>Why: a sampler that is exact should agree with the truth up to its Monte Carlo error; the
 * pass rule {@code |estimate - reference| <= k * mcse + floor} ({@link ValidationSettings})
 * fails a biased sampler once enough draws make the MCSE small, and passes an exact one whatever
 * the draw count, so the same suite runs quickly in the build and longer by hand.
 */
public final class Validator {
  private final List<ValidationCase> cases;
  private final ValidationSettings settings;

  private Validator(List<ValidationCase> cases, ValidationSettings settings) {
    this.cases = cases;
    this.settings = settings;
  }

  /**
   * The suite in {@code suiteFolder} (one sub-folder per case).
   *
   * @throws InvalidCaseException when the folder or a case in it is malformed
   */
  public static Validator of(Path suiteFolder, ValidationSettings settings) {
    if (suiteFolder == null || settings == null) {
      throw new IllegalArgumentException("suiteFolder and settings must not be null");
    }
    return new Validator(ValidationCase.readAll(suiteFolder), settings);
  }

  /** The case names, sorted. */
  public List<String> caseNames() {
    return cases.stream().map(ValidationCase::name).toList();
  }

  /**
   * Runs the cases named (all when {@code names} is empty), in suite order.
   *
   * @throws InvalidCaseException when a name is not a case of the suite
   */
  public List<CaseOutcome> run(List<String> names) {
    for (String name : names) {
      if (!caseNames().contains(name)) {
        throw new InvalidCaseException(
            "there is no validation case '" + name + "'; "
                + NameSuggestion.nearest(name, caseNames()).map(near -> "did you mean '" + near + "'? ")
                    .orElse("")
                + "the cases are " + String.join(", ", caseNames()));
      }
    }
    List<CaseOutcome> outcomes = new ArrayList<>();
    for (int i = 0; i < cases.size(); i++) {
      ValidationCase c = cases.get(i);
      if (names.isEmpty() || names.contains(c.name())) {
        // Each case its own seed, fixed by the suite seed and the case's name.
        outcomes.add(runCase(c, settings.seed() ^ c.name().hashCode()));
      }
    }
    return outcomes;
  }

  private CaseOutcome runCase(ValidationCase c, long seed) {
    List<Quantity> quantities;
    BoundModel model;
    try {
      quantities = resolveReferences(c);
      model = bind(c);
    } catch (ModelException | InvalidCaseException | IllegalArgumentException failed) {
      String message = failed instanceof ModelException m ? m.render() : failed.getMessage();
      return new CaseOutcome(c.name(), List.of(), message);
    }
    RunSettings run = RunSettings.of(settings.chains(), settings.burnIn(), settings.draws(), 1, seed);
    InMemoryFit fit = InMemoryFit.of(model, run);
    List<String> labels = fit.labels();
    List<UpdateReport> updates = fit.updates();
    List<QuantityCheck> checks = new ArrayList<>();
    for (Quantity q : quantities) {
      int index = labels.indexOf(q.unknown());
      if (index < 0) {
        return new CaseOutcome(
            c.name(), checks,
            q.name() + " names '" + q.unknown() + "', which is neither an unknown nor a kept"
                + " derived quantity of the model; these are " + String.join(", ", labels));
      }
      Estimates estimate = Estimates.of(q.statistic(), fit.draws(index));
      double tolerance = settings.k() * estimate.mcse() + q.floor();
      boolean pass = Math.abs(estimate.value() - q.reference()) <= tolerance;
      checks.add(
          new QuantityCheck(
              q.name(), q.reference(), estimate.value(), estimate.mcse(), tolerance,
              index < fit.unknownCount() ? updates.get(index).method() : UpdateFacts.DERIVED, pass));
    }
    return new CaseOutcome(c.name(), checks, null);
  }

  private static List<Quantity> resolveReferences(ValidationCase c) {
    boolean needed = c.quantities().stream().anyMatch(Quantity::computed);
    if (!needed) {
      return c.quantities();
    }
    CaseReference reference =
        QuadratureReferences.forCase(c.name())
            .orElseThrow(
                () -> new InvalidCaseException(
                    "case " + c.name() + " asks for computed references but has no Java reference"
                        + " (add one to QuadratureReferences)"));
    Map<String, Double> values = reference.values(c.folder());
    List<Quantity> resolved = new ArrayList<>();
    for (Quantity q : c.quantities()) {
      if (!q.computed()) {
        resolved.add(q);
        continue;
      }
      Double value = values.get(q.name());
      if (value == null) {
        throw new InvalidCaseException(
            "case " + c.name() + ": the Java reference computes " + values.keySet() + ", not " + q.name());
      }
      resolved.add(q.withReference(value));
    }
    return resolved;
  }

  private static BoundModel bind(ValidationCase c) {
    return new ModelInputs(c.model(), c.dataFiles()).bind();
  }
}
