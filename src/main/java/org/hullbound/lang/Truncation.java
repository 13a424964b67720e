package org.hullbound.lang;

/**
 * The {@code within lo .. hi} clause that truncates a family; either bound may be the literal
 * {@code inf} or {@code -inf}, which the parser turns into an infinite {@link Expression.Number}.
 */
public record Truncation(Expression lower, Expression upper, SourcePosition position) {}
