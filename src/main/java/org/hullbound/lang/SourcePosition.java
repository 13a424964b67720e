package org.hullbound.lang;

/**
 * A place in a model or data file: file name, 1-based line and 1-based column (counted in Unicode
 * code points, a tab counting as one).
 *
 * <p>Every token and syntax-tree node carries one, so that every error can point at its cause.
 */
public record SourcePosition(String file, int line, int column) {

  /** Renders the position as {@code file:line:col}, the form editors and terminals link. */
  @Override
  public String toString() {
    return file + ":" + line + ":" + column;
  }
}
