package org.hullbound.lang;

import java.util.List;

/**
 * One statement of a model file (one line, continued while a bracket is open).
 *
 * <p>Sealed so that binding handles every kind; the records keep exactly what was written, and
 * meaning (sizes, families, the graph) is the job of the {@code model} package.
 */
public sealed interface Statement {

  SourcePosition position();

  /** {@code model <name>}: names the model in outputs. */
  record ModelName(Identifier name, SourcePosition position) implements Statement {}

  /**
   * {@code index <set> = lo .. hi}, or {@code index <set>} with the size taken from the data;
   * {@code lower} and {@code upper} are {@code null} in the second form.
   */
  record Index(Identifier name, Expression lower, Expression upper, SourcePosition position)
      implements Statement {
    public boolean sizedFromData() {
      return lower == null;
    }
  }

  /**
   * Every {@code data} form. {@code targets} has several entries only in the bare form
   * ({@code data a[tray], b[tray]}); {@code inlineValues} is {@code null} unless values are given
   * inline ({@code = 5} or {@code = [1, 2, NA]}; NA is a NaN {@link InlineValue}); {@code
   * likelihood} is {@code null} unless the data is modelled with {@code ~}; {@code censoring} is
   * {@code null} unless the likelihood is followed by a {@code censored} clause.
   */
  record Data(
      List<Declarator> targets,
      List<InlineValue> inlineValues,
      Distribution likelihood,
      Censoring censoring,
      SourcePosition position)
      implements Statement {
    public Data {
      targets = List.copyOf(targets);
      inlineValues = inlineValues == null ? null : List.copyOf(inlineValues);
    }

    /** A data line without a {@code censored} clause. */
    public Data(
        List<Declarator> targets,
        List<InlineValue> inlineValues,
        Distribution likelihood,
        SourcePosition position) {
      this(targets, inlineValues, likelihood, null, position);
    }

    /** True for {@code data n = 5}: a scalar given without brackets. */
    public boolean inlineScalar() {
      return inlineValues != null && inlineValues.size() == 1 && targets.get(0).indexSets().isEmpty();
    }
  }

  /** {@code param <target> ~ <prior>}; truncation, if any, is on the distribution. */
  record Param(Declarator target, Distribution prior, SourcePosition position)
      implements Statement {}

  /**
   * {@code let <target> = <value>}, optionally marked {@code keep let} or {@code hide let}: whether
   * its values go with the draws. {@code marker} is where the mark was written, {@code null} for
   * {@link Keeping#DEFAULT}; {@code position} is the {@code let} keyword's.
   */
  record Let(
      Declarator target, Expression value, SourcePosition position, Keeping keeping,
      SourcePosition marker) implements Statement {
    public Let {
      if (keeping == null) {
        throw new IllegalArgumentException("keeping must not be null");
      }
      if ((marker == null) != (keeping == Keeping.DEFAULT)) {
        throw new IllegalArgumentException("a marker position goes with a keep or hide mark only");
      }
    }

    /** An unmarked {@code let}. */
    public Let(Declarator target, Expression value, SourcePosition position) {
      this(target, value, position, Keeping.DEFAULT, null);
    }
  }

  /**
   * Whether a {@code let}'s values are kept with the draws: by default a scalar is and a vector is
   * not (a linear predictor over 100,000 rows would swamp the draws file); {@code keep} and {@code
   * hide} before {@code let} say so explicitly.
   */
  enum Keeping {
    /** Unmarked: kept when a scalar. */
    DEFAULT,
    /** {@code keep let}: kept, every element of a vector too. */
    KEEP,
    /** {@code hide let}: never kept. */
    HIDE;

    /** The word written before {@code let}. */
    public String word() {
      return name().toLowerCase(java.util.Locale.ROOT);
    }
  }

  /**
   * {@code check <name> = <value>}: a test quantity of a posterior predictive check, one number
   * computed from a modelled data name (and possibly unknowns), compared between the observed
   * data and data replicated from the fitted model.
   */
  record Check(Identifier name, Expression value, SourcePosition position) implements Statement {}

  /** One value of an inline data vector; {@code NA} (missing) is held as NaN with missing set. */
  record InlineValue(double value, boolean missing, SourcePosition position) {}
}
