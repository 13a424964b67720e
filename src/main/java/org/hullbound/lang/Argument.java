package org.hullbound.lang;

/** One named argument of a family, as in {@code sd = spread}. */
public record Argument(Identifier name, Expression value) {}
