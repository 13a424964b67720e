package org.hullbound.hull;

/**
 * The log density and its derivative at one point, as returned by {@link
 * DifferentiableLogDensity#evaluate(double)}.
 *
 * <p>Value and slope come from one call because they usually share work (Gilks and Wild 1992 use
 * both at every new abscissa).
 *
 * @param value h(x) = log f(x) up to an additive constant; {@code -inf} where f(x) = 0
 * @param slope h'(x)
 */
public record Evaluation(double value, double slope) {}
