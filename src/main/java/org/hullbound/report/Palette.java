package org.hullbound.report;

/**
 * The report's own colours and dash patterns, one pair per chain, cycling after eight.
 *
 * <p>The hues are spaced apart and differ in lightness too; dashes tell the lines apart again on a
 * grey-scale print.
 */
final class Palette {
  private Palette() {}

  private static final String[] CHAIN_COLOURS = {
    "#1f6f8b", // deep sea blue
    "#d1773a", // copper
    "#5a8f3e", // moss
    "#8e4c8f", // heather
    "#b8443f", // brick
    "#3f4f9a", // indigo
    "#a68a1f", // mustard
    "#4b8a86", // grey teal
  };

  private static final String[] CHAIN_DASHES = {
    "", "5 2", "1.5 1.5", "6 2 1.5 2", "3 3", "8 2", "1.5 3", "4 1.5 1.5 1.5",
  };

  static final String INK = "#1e2329";
  static final String MUTED = "#5d6670";
  static final String GRID = "#e4e1da";
  static final String BAND = "#ece8dd";
  static final String ACCENT = "#1f6f8b";

  static String colour(int chain) {
    return CHAIN_COLOURS[Math.floorMod(chain, CHAIN_COLOURS.length)];
  }

  static String dash(int chain) {
    return CHAIN_DASHES[Math.floorMod(chain, CHAIN_DASHES.length)];
  }
}
