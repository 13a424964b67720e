package org.hullbound.report;

/**
 * The words of one plot panel: its title, the kind of plot (a CSS-friendly word such as {@code
 * trace}) and the two axis labels.
 *
 * <p>Kept apart from the data so every panel factory of {@link SvgPlot} takes the same labels.
 *
 * @param kind a lower-case word naming the kind of panel, used as a class name ({@code plot-KIND})
 * @param title the heading written above the panel
 * @param xLabel the label under the horizontal axis, may be empty
 * @param yLabel the label beside the vertical axis, may be empty
 */
public record PanelLabels(String kind, String title, String xLabel, String yLabel) {

  /** Checks that the kind is a plain lower-case word and replaces null labels by empty ones. */
  public PanelLabels {
    if (kind == null || !kind.matches("[a-z][a-z0-9-]*")) {
      throw new IllegalArgumentException(
          "kind must be a lower-case word of letters, digits and '-', got " + kind);
    }
    title = title == null ? "" : title;
    xLabel = xLabel == null ? "" : xLabel;
    yLabel = yLabel == null ? "" : yLabel;
  }
}
