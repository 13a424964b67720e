package org.hullbound.validation;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.hullbound.io.CsvData;

/**
 * One case of the validation suite, as found in its folder {@code validation/<name>/}: the model,
 * its data files (every other {@code .csv}) and the quantities of {@code reference.csv}.
 *
 * <p>{@code reference.csv} has the header {@code quantity,reference,floor}; a reference is a
 * number, or the word {@code quadrature} (or {@code computed}) when the case's Java reference
 * computes it at run time.
 */
record ValidationCase(String name, Path folder, Path model, List<Path> dataFiles, List<Quantity> quantities) {
  static final String MODEL_FILE = "model.hbm";
  static final String REFERENCE_FILE = "reference.csv";

  ValidationCase {
    dataFiles = List.copyOf(dataFiles);
    quantities = List.copyOf(quantities);
  }

  /**
   * Reads the case in {@code folder}.
   *
   * @throws InvalidCaseException when the model or reference file is missing or malformed
   */
  static ValidationCase read(Path folder) {
    String name = folder.getFileName().toString();
    Path model = folder.resolve(MODEL_FILE);
    Path reference = folder.resolve(REFERENCE_FILE);
    if (!Files.isRegularFile(model)) {
      throw new InvalidCaseException("case " + name + ": " + model + " is missing");
    }
    if (!Files.isRegularFile(reference)) {
      throw new InvalidCaseException("case " + name + ": " + reference + " is missing");
    }
    List<Path> data = new ArrayList<>();
    try (Stream<Path> files = Files.list(folder)) {
      files.filter(p -> p.getFileName().toString().endsWith(".csv"))
          .filter(p -> !p.getFileName().toString().equals(REFERENCE_FILE))
          .sorted()
          .forEach(data::add);
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return new ValidationCase(name, folder, model, data, readQuantities(name, reference));
  }

  private static List<Quantity> readQuantities(String name, Path file) {
    List<CsvData.TextRow> rows = CsvData.readText(file);
    List<String> header = rows.isEmpty() ? List.of() : rows.get(0).cells();
    if (!header.equals(List.of("quantity", "reference", "floor"))) {
      throw new InvalidCaseException(
          "case " + name + ": " + file + " must have the header quantity,reference,floor, got "
              + String.join(",", header));
    }
    List<Quantity> quantities = new ArrayList<>();
    for (CsvData.TextRow row : rows.subList(1, rows.size())) {
      String where = file + ":" + row.line();
      try {
        String reference = row.cells().get(1);
        boolean computed = reference.equals("quadrature") || reference.equals("computed");
        double value = computed ? Double.NaN : Double.parseDouble(reference);
        if (!computed && !Double.isFinite(value)) {
          throw new IllegalArgumentException("reference must be finite, got " + reference);
        }
        quantities.add(
            Quantity.of(row.cells().get(0), value, computed, Double.parseDouble(row.cells().get(2))));
      } catch (IllegalArgumentException | IndexOutOfBoundsException bad) {
        throw new InvalidCaseException(where + ": " + bad.getMessage());
      }
    }
    if (quantities.isEmpty()) {
      throw new InvalidCaseException("case " + name + ": " + file + " lists no quantity");
    }
    return quantities;
  }

  /** Every case folder under {@code root} (folders holding a model.hbm), sorted by name. */
  static List<ValidationCase> readAll(Path root) {
    if (!Files.isDirectory(root)) {
      throw new InvalidCaseException("the validation folder " + root + " does not exist");
    }
    List<ValidationCase> cases = new ArrayList<>();
    try (Stream<Path> folders = Files.list(root)) {
      for (Path folder : folders.filter(Files::isDirectory).sorted().toList()) {
        if (Files.isRegularFile(folder.resolve(MODEL_FILE))) {
          cases.add(read(folder));
        }
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return cases;
  }
}
