package org.hullbound.model;

import org.apache.commons.math3.special.Gamma;
import org.hullbound.model.family.LogSpace;

/**
 * The operators and functions of the model language with their values and first derivatives,
 * the single table that constant folding, the compiled evaluators and the analyses share.
 *
 * <p>To add a function: add a constant here (name, arity, smoothness, value, derivative), add it
 * to the parser's function table ({@code org.hullbound.lang.Functions}), and test it against
 * central differences in {@code OpTest}.
 */
enum Op {
  ADD("+", -1, true),
  SUBTRACT("-", 2, true),
  MULTIPLY("*", 2, true),
  DIVIDE("/", 2, true),
  POWER("^", 2, true),
  NEGATE("-", 1, true),
  EXP("exp", 1, true),
  LOG("log", 1, true),
  LOG1P("log1p", 1, true),
  EXPM1("expm1", 1, true),
  SQRT("sqrt", 1, true),
  ABS("abs", 1, false),
  LOGIT("logit", 1, true),
  EXPIT("expit", 1, true),
  LOG_EXPIT("log_expit", 1, true),
  LGAMMA("lgamma", 1, true),
  MIN("min", 2, false),
  MAX("max", 2, false),
  /** 1 when a &gt; b, else 0: an indicator, for checks only (the parser keeps it out of densities). */
  ABOVE("above", 2, false),
  /** 1 when a &lt; b, else 0. */
  BELOW("below", 2, false),
  /**
   * 1 when both parts are equal, else 0: not a function of the language but the indicator that an
   * unknown index is lowered to ({@code mu[g]} is the sum over k of {@code mu[k] * [g = k]}, see
   * {@code UnknownIndex}). Its symbol is no identifier, so {@link #function} never finds it.
   */
  EQUAL("=", 2, false);

  private final String symbol;
  private final int arity;
  private final boolean smooth;

  Op(String symbol, int arity, boolean smooth) {
    this.symbol = symbol;
    this.arity = arity;
    this.smooth = smooth;
  }

  String symbol() {
    return symbol;
  }

  /** The number of parts, or -1 for the n-ary sum. */
  int arity() {
    return arity;
  }

  /** False for functions with a kink (abs, min, max): the derivative-free hull is needed. */
  boolean smooth() {
    return smooth;
  }

  /** The function of the language called {@code name}, or {@code null}. */
  static Op function(String name) {
    for (Op op : values()) {
      if (op.ordinal() >= EXP.ordinal() && op.symbol.equals(name)) {
        return op;
      }
    }
    return null;
  }

  /** The value of a one-argument function at {@code a}. */
  double unary(double a) {
    switch (this) {
      case NEGATE:
        return -a;
      case EXP:
        return Math.exp(a);
      case LOG:
        return Math.log(a);
      case LOG1P:
        return LogSpace.log1p(a);
      case EXPM1:
        return Math.expm1(a);
      case SQRT:
        return Math.sqrt(a);
      case ABS:
        return Math.abs(a);
      case LOGIT:
        return Math.log(a) - LogSpace.log1p(-a);
      case EXPIT:
        return inverseLogit(a);
      case LOG_EXPIT:
        return logInverseLogit(a);
      case LGAMMA:
        return Gamma.logGamma(a);
      default:
        throw new IllegalStateException(this + " is not a one-argument function");
    }
  }

  /** The derivative of a one-argument function at {@code a}, given its value {@code value}. */
  double unaryDerivative(double a, double value) {
    switch (this) {
      case NEGATE:
        return -1;
      case EXP:
        return value;
      case LOG:
        return 1 / a;
      case LOG1P:
        return 1 / (1 + a);
      case EXPM1:
        return value + 1;
      case SQRT:
        return 0.5 / value;
      case ABS:
        return a > 0 ? 1 : a < 0 ? -1 : 0;
      case LOGIT:
        return 1 / (a * (1 - a));
      case EXPIT:
        return value * (1 - value);
      case LOG_EXPIT:
        return inverseLogit(-a);
      case LGAMMA:
        return Gamma.digamma(a);
      default:
        throw new IllegalStateException(this + " is not a one-argument function");
    }
  }

  /** The value of a two-argument operation. */
  double binary(double a, double b) {
    switch (this) {
      case SUBTRACT:
        return a - b;
      case MULTIPLY:
        return a * b;
      case DIVIDE:
        return a / b;
      case POWER:
        return Math.pow(a, b);
      case MIN:
        return Math.min(a, b);
      case MAX:
        return Math.max(a, b);
      case ABOVE:
        return a > b ? 1 : 0;
      case BELOW:
        return a < b ? 1 : 0;
      case EQUAL:
        return a == b ? 1 : 0;
      default:
        throw new IllegalStateException(this + " is not a two-argument operation");
    }
  }

  /** {@code 1 / (1 + exp(-a))} without overflow for large negative {@code a}. */
  static double inverseLogit(double a) {
    if (a >= 0) {
      return 1 / (1 + Math.exp(-a));
    }
    double e = Math.exp(a);
    return e / (1 + e);
  }

  /** {@code log(expit(a)) = -log1p(exp(-a))}, accurate in both tails. */
  static double logInverseLogit(double a) {
    return a >= 0 ? -LogSpace.log1p(Math.exp(-a)) : a - LogSpace.log1p(Math.exp(a));
  }
}
