package org.hullbound.io;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.NumberSyntax;
import org.hullbound.lang.SourceText;

/**
 * Reads the starting values given with {@code --init}: a CSV of {@code name,value} rows, such as
 * {@code spread,0.5} or {@code "effect[3]",-1.2}, with an optional {@code name,value} header.
 *
 * <p>The values are on the natural scale of each unknown; unknowns not named start dispersed as
 * usual. Faults are reported as {@link ModelException}s with file, line and column.
 */
public final class InitialValuesFile {
  private InitialValuesFile() {}

  /** The values of {@code file}, in file order. */
  public static Map<String, Double> read(Path file) {
    String text;
    try {
      text = TextFiles.readUtf8(file, "starting values file");
    } catch (UncheckedIOException e) {
      if (e.getCause() instanceof NoSuchFileException) {
        throw new ModelException(
            SourceText.of(file.toString(), "").position(1, 1), null,
            "starting values file not found", null);
      }
      throw e;
    }
    return parse(file.toString(), text);
  }

  /** The values in {@code text}, read as if from a file called {@code fileName}. */
  public static Map<String, Double> parse(String fileName, String text) {
    SourceText source = SourceText.of(fileName, text);
    Map<String, Double> values = new LinkedHashMap<>();
    try (CSVParser parser = CSVParser.parse(text, CSVFormat.RFC4180)) {
      for (CSVRecord record : parser) {
        int line = (int) record.getRecordNumber();
        int lineNumber = lineOf(source, record);
        if (record.size() == 1 && record.get(0).isBlank()) {
          continue;
        }
        if (record.size() != 2) {
          throw ModelException.at(
              source, source.position(lineNumber, 1),
              "expected two fields, name and value, got " + record.size(), null);
        }
        String name = record.get(0).trim();
        String value = record.get(1).trim();
        if (values.isEmpty() && line == 1 && name.equals("name") && value.equals("value")) {
          continue;
        }
        if (name.isEmpty()) {
          throw ModelException.at(
              source, source.position(lineNumber, 1), "expected the name of an unknown", null);
        }
        double number;
        try {
          number = NumberSyntax.parse(value);
        } catch (NumberSyntax.InvalidNumberException notNumber) {
          throw ModelException.at(
              source, source.position(lineNumber, columnOfSecondField(source, lineNumber)),
              "expected a number as the value of '" + name + "', got '" + value + "', which "
                  + notNumber.reason(),
              notNumber.hint());
        }
        if (!Double.isFinite(number)) {
          throw ModelException.at(
              source, source.position(lineNumber, columnOfSecondField(source, lineNumber)),
              "expected a finite starting value for '" + name + "', got " + value, null);
        }
        if (values.put(name, number) != null) {
          throw ModelException.at(
              source, source.position(lineNumber, 1),
              "'" + name + "' is given more than once", null);
        }
      }
    } catch (IOException | UncheckedIOException | IllegalStateException e) {
      throw CsvQuotes.error(fileName, text, e);
    }
    return Collections.unmodifiableMap(values);
  }

  /** The 1-based line where {@code record} starts (records may span lines inside quotes). */
  private static int lineOf(SourceText source, CSVRecord record) {
    long characters = record.getCharacterPosition();
    int line = 1;
    long seen = 0;
    while (line < source.lineCount() && seen + source.line(line).length() + 1 <= characters) {
      seen += source.line(line).length() + 1;
      line++;
    }
    return line;
  }

  private static int columnOfSecondField(SourceText source, int line) {
    String text = source.line(line);
    boolean quoted = false;
    for (int i = 0; i < text.length(); i++) {
      char c = text.charAt(i);
      if (c == '"') {
        quoted = !quoted;
      } else if (c == ',' && !quoted) {
        return i + 2;
      }
    }
    return 1;
  }
}
