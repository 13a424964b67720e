package org.hullbound.app;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataSummary;
import org.hullbound.model.Unknown;

/**
 * Says, per modelled data name, how many of its cells are missing and will be imputed, and where
 * they were read from: an empty cell is easily left by accident, so {@code check} and {@code fit}
 * name the count before sampling instead of silently adding unknowns.
 */
public final class ImputedCells {
  private ImputedCells() {}

  /**
   * One sentence per modelled data name with missing cells, in state order, such as {@code "3
   * cells of 'y' in d.csv are missing (empty or NA) and will be imputed"}; empty when none are.
   */
  public static List<String> of(BoundModel model) {
    Map<String, Integer> counts = new LinkedHashMap<>();
    for (Unknown unknown : model.unknowns()) {
      if (unknown.imputed()) {
        counts.merge(unknown.node(), 1, Integer::sum);
      }
    }
    List<String> lines = new ArrayList<>();
    for (Map.Entry<String, Integer> entry : counts.entrySet()) {
      String name = entry.getKey();
      int count = entry.getValue();
      String source = sourceOf(model, name);
      lines.add(
          count + (count == 1 ? " cell" : " cells") + " of '" + name + "'"
              + (source.equals("inline") ? " (inline, NA)" : " in " + source)
              + (count == 1 ? " is" : " are") + " missing"
              + (source.equals("inline") ? "" : " (empty or NA)")
              + " and will be imputed");
    }
    return lines;
  }

  private static String sourceOf(BoundModel model, String name) {
    for (DataSummary summary : model.data()) {
      for (String column : summary.columns()) {
        if (column.equals(name) || column.startsWith(name + "[")) {
          return summary.source();
        }
      }
    }
    return "the data";
  }
}
