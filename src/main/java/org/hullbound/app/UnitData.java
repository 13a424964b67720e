package org.hullbound.app;

import java.io.Serializable;
import java.util.List;

/**
 * One unit of a batch: its name and its data files as text (its own, then those shared by every
 * unit), or why its data could not be gathered.
 *
 * @param name the unit's name (its folder's name, or its value in the unit column)
 * @param files the data files in the order binding reads them; empty when {@code problem} is set
 * @param problem why the unit has no data (an unreadable file, a folder without CSV files), or
 *     null
 */
public record UnitData(String name, List<DataText> files, String problem) implements Serializable {
  public UnitData {
    if (name == null || files == null) {
      throw new IllegalArgumentException("name and files must not be null");
    }
    files = List.copyOf(files);
  }

  /** A unit with its data. */
  public static UnitData of(String name, List<DataText> files) {
    return new UnitData(name, files, null);
  }

  /** A unit whose data could not be gathered, for {@code problem}. */
  public static UnitData unreadable(String name, String problem) {
    return new UnitData(name, List.of(), problem);
  }
}
