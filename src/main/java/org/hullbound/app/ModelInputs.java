package org.hullbound.app;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.hullbound.io.CheckpointFile;
import org.hullbound.io.CsvData;
import org.hullbound.io.TextFiles;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.lang.Statement;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.hullbound.model.EmptyCells;

/**
 * A model file and its data files, as named on a command line: read, parsed and bound the same
 * way by every command.
 *
 * @param modelFile the model (.hbm)
 * @param dataFiles the data CSV files, in the order given
 * @param emptyCells whether an empty cell of a modelled column is imputed or refused
 */
public record ModelInputs(Path modelFile, List<Path> dataFiles, EmptyCells emptyCells) {
  public ModelInputs {
    if (modelFile == null || dataFiles == null || emptyCells == null) {
      throw new IllegalArgumentException("modelFile, dataFiles and emptyCells must not be null");
    }
    dataFiles = List.copyOf(dataFiles);
  }

  /** The files, with empty cells of modelled columns imputed. */
  public ModelInputs(Path modelFile, List<Path> dataFiles) {
    this(modelFile, dataFiles, EmptyCells.IMPUTED);
  }

  /**
   * The parsed model.
   *
   * @throws org.hullbound.lang.ModelException when the text is not a model
   */
  public ModelFile parse() {
    return Parser.parse(SourceText.of(modelFile.toString(), modelText()));
  }

  /** The model file's text as read now, for the report's top. */
  public String modelText() {
    return TextFiles.readUtf8(modelFile, "model file");
  }

  /**
   * Every data file read, keeping the columns {@code parsed} reads ({@link
   * BoundModel#readsColumn}); the others are checked for shape only.
   */
  public List<DataTable> tables(ModelFile parsed) {
    if (dataFiles.isEmpty()) {
      requireNoFileData(parsed);
    }
    List<DataTable> tables = new ArrayList<>();
    for (Path file : dataFiles) {
      tables.add(CsvData.read(file, BoundModel.readsColumn(parsed)));
    }
    return tables;
  }

  /**
   * Refuses a model that reads data from a file when no data file was given, naming that data, so
   * that the first message is the missing file rather than what binding without it leads to.
   */
  private void requireNoFileData(ModelFile parsed) {
    List<String> names = new ArrayList<>();
    for (Statement statement : parsed.statements()) {
      if (statement instanceof Statement.Data data && data.inlineValues() == null) {
        data.targets().forEach(target -> names.add("'" + target.name().text() + "'"));
      }
    }
    if (!names.isEmpty()) {
      throw new RunRefusedException(
          "no data file was given, but " + modelFile + " reads "
              + "the data " + joined(names)
              + " from one; give it with --data FILE.csv");
    }
  }

  /** {@code 'a'}, {@code 'a' and 'b'}, {@code 'a', 'b' and 'c'}. */
  private static String joined(List<String> items) {
    if (items.size() == 1) {
      return items.get(0);
    }
    return String.join(", ", items.subList(0, items.size() - 1)) + " and "
        + items.get(items.size() - 1);
  }

  /** The model bound to its data. */
  public BoundModel bind() {
    ModelFile parsed = parse();
    return BoundModel.bind(parsed, tables(parsed), emptyCells);
  }

  /** SHA-256 of the model and data texts as read now (see {@link CheckpointFile#inputHash}). */
  public String inputHash() {
    List<String> dataTexts = new ArrayList<>();
    for (Path file : dataFiles) {
      dataTexts.add(TextFiles.readUtf8(file, "data file"));
    }
    return CheckpointFile.inputHash(TextFiles.readUtf8(modelFile, "model file"), dataTexts);
  }
}
