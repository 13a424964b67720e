package org.hullbound.report;

import java.util.List;

/**
 * What a run was fitted from, shown at the top of the report: the model text as written, and one
 * line per data source (its rows and the missing cells that became imputed unknowns).
 *
 * <p>A reader checks these first: a wrong file or a column read as missing explains odd estimates
 * faster than any plot. Both parts may be empty when not known (a page re-rendered from a folder
 * whose model file has moved).
 *
 * @param modelText the model file's text, or "" when not known
 * @param data the data sources in the order they were given
 */
public record RunSources(String modelText, List<DataSource> data) {

  /** One data source: a file name (or "inline"), its rows, and its missing cells. */
  public record DataSource(String source, int rows, int missingCells) {
    /** Checks the counts. */
    public DataSource {
      if (source == null || rows < 0 || missingCells < 0) {
        throw new IllegalArgumentException(
            "source must not be null and counts must be >= 0, got " + rows + ", " + missingCells);
      }
    }
  }

  /** Checks for null and copies the list. */
  public RunSources {
    modelText = modelText == null ? "" : modelText;
    if (data == null || data.stream().anyMatch(d -> d == null)) {
      throw new IllegalArgumentException("data must be a list without null entries");
    }
    data = List.copyOf(data);
  }

  /** Nothing known: no model text, no data sources. */
  public static RunSources unknown() {
    return new RunSources("", List.of());
  }

  /** Whether there is anything to show. */
  public boolean isEmpty() {
    return modelText.isBlank() && data.isEmpty();
  }
}
