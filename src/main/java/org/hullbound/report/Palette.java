package org.hullbound.report;

/**
 * The report's own colours and dash patterns, one pair per chain, cycling after eight.
 *
 * <p>The hues are those of Paul Tol's "muted" qualitative scheme, designed to stay distinct for
 * readers with the common colour-vision deficiencies (P. Tol, "Colour schemes", SRON technical
 * note SRON/EPS/TN/09-002, 2021), in an order of our own that puts the dark, well-contrasted hues
 * first. Colour is never the only mark: every chain also has its own dash pattern, so the lines
 * stay apart on a grey-scale print and for readers who cannot tell the hues apart.
 */
final class Palette {
  private Palette() {}

  private static final String[] CHAIN_COLOURS = {
    "#882255", // wine
    "#44aa99", // teal
    "#332288", // indigo
    "#999933", // olive
    "#cc6677", // rose
    "#117733", // green
    "#88ccee", // cyan
    "#ddcc77", // sand
  };

  private static final String[] CHAIN_DASHES = {
    "", "5 2", "1.5 1.5", "6 2 1.5 2", "3 3", "8 2", "1.5 3", "4 1.5 1.5 1.5",
  };

  static final String INK = "#1e2329";
  static final String MUTED = "#5d6670";
  static final String GRID = "#e4e1da";
  static final String BAND = "#ece8dd";
  static final String ACCENT = "#332288";

  static String colour(int chain) {
    return CHAIN_COLOURS[Math.floorMod(chain, CHAIN_COLOURS.length)];
  }

  static String dash(int chain) {
    return CHAIN_DASHES[Math.floorMod(chain, CHAIN_DASHES.length)];
  }
}
