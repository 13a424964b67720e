package org.hullbound.lang;

/** A name as written in the model file, with where it was written. */
public record Identifier(String text, SourcePosition position) {}
