package org.hullbound.cli;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.hullbound.app.ModelInputs;
import org.hullbound.model.EmptyCells;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * The model file and its data files, declared once for every command that reads a model ({@code
 * check}, {@code fit}, {@code calibrate}) as a picocli mixin.
 */
public final class ModelOptions {

  @Parameters(index = "0", paramLabel = "MODEL", description = "The model file (.hbm).")
  Path modelFile;

  @Option(
      names = "--data",
      paramLabel = "FILE",
      description = "A data file (CSV with a header row); repeat for one file per index set.")
  List<Path> dataFiles = new ArrayList<>();

  @Option(
      names = "--no-empty-cells",
      description = "Refuse an empty cell in a modelled data column (naming its file, line and"
          + " column) instead of imputing it; cells written NA are still imputed.")
  boolean noEmptyCells;

  /** The files as the application layer reads them. */
  ModelInputs inputs() {
    return new ModelInputs(
        modelFile, dataFiles, noEmptyCells ? EmptyCells.REFUSED : EmptyCells.IMPUTED);
  }
}
