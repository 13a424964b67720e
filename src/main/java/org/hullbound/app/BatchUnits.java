package org.hullbound.app;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.hullbound.io.CsvData;

/**
 * The units of a batch, read from one of its two forms (docs/batch.md):
 *
 * <ul>
 *   <li>a folder with one subfolder per unit, named as the unit, holding that unit's CSV files
 *       (read in name order, as if each were given with {@code --data});
 *   <li>CSV files with a unit column: every file that has the column is split by its value (each
 *       unit keeps its own rows, without the unit column, which is no data of the model), files
 *       without it are shared.
 * </ul>
 *
 * <p>Files given as shared ({@code --data} beside a units folder) follow each unit's own files. A
 * unit whose files cannot be read becomes a unit with a problem, so that the others still run; a
 * form that gives no unit at all is refused.
 */
public final class BatchUnits {
  private BatchUnits() {}

  /**
   * One unit per subfolder of {@code folder}, in name order.
   *
   * @throws RunRefusedException when {@code folder} is not a folder or holds no subfolder
   */
  public static List<UnitData> fromFolder(Path folder, List<Path> shared) {
    if (!Files.isDirectory(folder)) {
      throw new RunRefusedException("--units " + folder + " is not a folder");
    }
    List<DataText> sharedTexts = readAll(shared);
    List<UnitData> units = new ArrayList<>();
    for (Path sub : list(folder)) {
      String name = sub.getFileName().toString();
      if (!Files.isDirectory(sub) || name.startsWith(".")) {
        continue;
      }
      try {
        List<Path> files =
            list(sub).stream()
                .filter(file -> file.getFileName().toString().endsWith(".csv"))
                .filter(Files::isRegularFile)
                .toList();
        if (files.isEmpty()) {
          units.add(UnitData.unreadable(name, "the folder " + sub + " holds no .csv file"));
          continue;
        }
        List<DataText> texts = readAll(files);
        texts.addAll(sharedTexts);
        units.add(UnitData.of(name, texts));
      } catch (UncheckedIOException unreadable) {
        units.add(UnitData.unreadable(name, unreadable.getMessage()));
      }
    }
    if (units.isEmpty()) {
      throw new RunRefusedException(
          "--units " + folder + " holds no unit: give it one subfolder of CSV files per unit");
    }
    return units;
  }

  /**
   * One unit per value of {@code column}, in the order the values first appear; files without the
   * column are shared by every unit.
   *
   * @throws RunRefusedException when no file has the column or a row's unit cell is empty
   * @throws org.hullbound.lang.ModelException when a file is not valid CSV
   */
  public static List<UnitData> byColumn(List<Path> files, String column) {
    Map<String, Map<Path, List<CsvData.TextRow>>> rowsByUnit = new LinkedHashMap<>();
    Map<Path, List<String>> headers = new LinkedHashMap<>();
    Map<Path, Integer> unitColumns = new LinkedHashMap<>();
    List<Path> sharedFiles = new ArrayList<>();
    for (Path file : files) {
      List<CsvData.TextRow> rows = CsvData.readText(file);
      List<String> header = rows.isEmpty() ? List.of() : rows.get(0).cells();
      int at = header.indexOf(column);
      if (at < 0) {
        sharedFiles.add(file);
        continue;
      }
      headers.put(file, header);
      unitColumns.put(file, at);
      for (CsvData.TextRow row : rows.subList(1, rows.size())) {
        String unit = at < row.cells().size() ? row.cells().get(at) : "";
        if (unit.isEmpty()) {
          throw new RunRefusedException(
              file + ":" + row.line() + ": the unit column '" + column + "' is empty in this row;"
                  + " every row needs its unit");
        }
        rowsByUnit.computeIfAbsent(unit, u -> new LinkedHashMap<>())
            .computeIfAbsent(file, f -> new ArrayList<>()).add(row);
      }
    }
    if (headers.isEmpty()) {
      throw new RunRefusedException(
          "no --data file has a column named '" + column + "' (--unit-column names the column"
              + " that says which unit a row belongs to)");
    }
    List<DataText> shared = readAll(sharedFiles);
    List<UnitData> units = new ArrayList<>();
    for (Map.Entry<String, Map<Path, List<CsvData.TextRow>>> unit : rowsByUnit.entrySet()) {
      List<DataText> texts = new ArrayList<>();
      for (Map.Entry<Path, List<String>> split : headers.entrySet()) {
        texts.add(new DataText(split.getKey().toString(),
            csv(split.getValue(), unit.getValue().getOrDefault(split.getKey(), List.of()),
                unitColumns.get(split.getKey()))));
      }
      texts.addAll(shared);
      units.add(UnitData.of(unit.getKey(), texts));
    }
    if (units.isEmpty()) {
      throw new RunRefusedException("the files with the unit column '" + column + "' have no rows");
    }
    return units;
  }

  private static List<String> without(List<String> cells, int dropped) {
    List<String> kept = new ArrayList<>(cells);
    if (dropped < kept.size()) {
      kept.remove(dropped);
    }
    return kept;
  }

  private static List<DataText> readAll(List<Path> files) {
    List<DataText> texts = new ArrayList<>();
    for (Path file : files) {
      texts.add(DataText.read(file));
    }
    return texts;
  }

  private static List<Path> list(Path folder) {
    try (var entries = Files.list(folder)) {
      return entries.sorted().toList();
    } catch (IOException e) {
      throw new UncheckedIOException("cannot list " + folder + ": " + e.getMessage(), e);
    }
  }

  /** The header and rows without column {@code dropped}, as CSV (RFC 4180, quoted where needed). */
  private static String csv(List<String> header, List<CsvData.TextRow> rows, int dropped) {
    StringBuilder out = new StringBuilder();
    try {
      CSVPrinter printer =
          new CSVPrinter(out, CSVFormat.RFC4180.builder().setRecordSeparator("\n").get());
      printer.printRecord(without(header, dropped));
      for (CsvData.TextRow row : rows) {
        printer.printRecord(without(row.cells(), dropped));
      }
      printer.flush();
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return out.toString();
  }
}
