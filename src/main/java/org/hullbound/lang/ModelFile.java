package org.hullbound.lang;

import java.util.List;

/**
 * A parsed model file: its statements in written order and its source text, kept so that later
 * stages can show the offending line under an error.
 */
public record ModelFile(SourceText source, List<Statement> statements) {
  public ModelFile {
    statements = List.copyOf(statements);
  }
}
