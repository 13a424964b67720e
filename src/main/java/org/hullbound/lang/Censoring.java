package org.hullbound.lang;

/**
 * The {@code censored lo .. hi [when flag]} clause of a modelled {@code data} line: in the rows it
 * applies to, the value is known only to lie between the limits (right censoring with {@code hi =
 * inf}, left censoring with {@code lo = -inf}, interval censoring otherwise), and the row
 * contributes the probability of that interval instead of a density.
 *
 * <p>{@code when} is {@code null} when every row is censored; otherwise it is a 0/1 expression of
 * the data, 1 in the censored rows and 0 in the exact ones. The limits may be {@code inf} or
 * {@code -inf}; the binder checks that limits and flag are known and that the limits are ordered.
 */
public record Censoring(
    Expression lower, Expression upper, Expression when, SourcePosition position) {}
