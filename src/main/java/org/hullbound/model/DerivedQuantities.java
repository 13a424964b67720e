package org.hullbound.model;

import java.util.ArrayList;
import java.util.List;

/**
 * The {@code let} quantities kept with the draws, compiled once, and the decision for every
 * {@code let} of the model (kept or not, and why) for {@code check} to list.
 *
 * <p>Which are kept: a scalar {@code let} by default, a vector only when marked {@code keep let}
 * (a linear predictor over 100,000 rows is not written by accident), none marked {@code hide
 * let}; and only a quantity that depends on an unknown (one fixed by the data would be the same
 * number in every draw). Values are computed from a chain's state after each kept sweep, so they
 * need no state of their own: a resumed run recomputes them from the restored state bit for bit.
 */
public final class DerivedQuantities {

  /**
   * What happens to one {@code let}: kept or not, and why, in plain words.
   *
   * @param name the let as declared, {@code ld50} or {@code rate[site]}
   * @param elements its number of elements (1 for a scalar)
   * @param kept whether its elements are columns of the draws
   * @param why the reason, e.g. {@code "a scalar: kept by default"}
   */
  public record Choice(String name, int elements, boolean kept, String why) {}

  private static final DerivedQuantities NONE = new DerivedQuantities(List.of(), List.of(), List.of());

  private final List<String> labels;
  private final List<Evaluator> evaluators;
  private final List<Choice> choices;

  private DerivedQuantities(List<String> labels, List<Evaluator> evaluators, List<Choice> choices) {
    this.labels = List.copyOf(labels);
    this.evaluators = List.copyOf(evaluators);
    this.choices = List.copyOf(choices);
  }

  /** No derived quantities (a model without lets). */
  public static DerivedQuantities none() {
    return NONE;
  }

  /** The labels of the kept elements ({@code ld50}, {@code rate[2]}), in statement order. */
  public List<String> labels() {
    return labels;
  }

  /** The number of kept elements. */
  public int size() {
    return labels.size();
  }

  /** Every let of the model with what happens to it, in statement order. */
  public List<Choice> choices() {
    return choices;
  }

  /**
   * Writes the kept values at {@code state} (every unknown, natural scale) into {@code out} from
   * {@code from} on. Safe to call from several chains at once.
   */
  public void evaluate(double[] state, double[] out, int from) {
    Frame frame = new Frame(Double.NaN, state);
    for (int k = 0; k < evaluators.size(); k++) {
      out[from + k] = evaluators.get(k).eval(frame);
    }
  }

  /** Collects the decisions while binding; the {@link Binder} alone builds one. */
  static final class Builder {
    private final List<String> labels = new ArrayList<>();
    private final List<Evaluator> evaluators = new ArrayList<>();
    private final List<Choice> choices = new ArrayList<>();

    void keep(String name, List<String> elementLabels, List<Formula> formulas, String why) {
      for (int e = 0; e < formulas.size(); e++) {
        labels.add(elementLabels.get(e));
        evaluators.add(Evaluator.compile(formulas.get(e), -1));
      }
      choices.add(new Choice(name, formulas.size(), true, why));
    }

    void leaveOut(String name, int elements, String why) {
      choices.add(new Choice(name, elements, false, why));
    }

    DerivedQuantities build() {
      return choices.isEmpty() ? NONE : new DerivedQuantities(labels, evaluators, choices);
    }
  }
}
