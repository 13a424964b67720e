package org.hullbound.validation;

import java.util.ArrayList;
import java.util.List;
import org.hullbound.app.DataText;
import org.hullbound.app.ModelInputs;
import org.hullbound.app.TaskEngine;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;

/**
 * One replicate of a simulation-based calibration as a task of a {@link TaskEngine}: it carries
 * the model's and the data's text and the settings, builds the {@link Calibration} where it runs,
 * and gives the ranks of the replicate it is handed ({@link Calibration#replicate}). So the
 * replicates of one calibration can run on local workers or on Spark and give the same ranks as
 * {@link Calibration#run} one after another.
 */
public final class CalibrationTask implements TaskEngine.Task<Integer, CalibrationTask.Ranks> {
  private static final long serialVersionUID = 1L;

  private final String modelFileName;
  private final String modelText;
  private final List<DataText> data;
  private final CalibrationSettings settings;
  /** Built once per copy of the task, where it runs. */
  private transient Calibration calibration;

  /** The ranks of one replicate, from 0. */
  public record Ranks(int replicate, int[] ranks) implements TaskEngine.Outcome {
    public Ranks {
      ranks = ranks.clone();
    }

    @Override
    public int[] ranks() {
      return ranks.clone();
    }

    @Override
    public boolean failed() {
      return false;
    }
  }

  private CalibrationTask(
      String modelFileName, String modelText, List<DataText> data, CalibrationSettings settings) {
    this.modelFileName = modelFileName;
    this.modelText = modelText;
    this.data = List.copyOf(data);
    this.settings = settings;
  }

  /**
   * The calibration of the model and data files of {@code inputs}, read now, with {@code settings}.
   *
   * @throws org.hullbound.lang.ModelException when the model or data are wrong
   * @throws org.hullbound.model.SimulationException when the model cannot be simulated
   */
  public static CalibrationTask of(ModelInputs inputs, CalibrationSettings settings) {
    if (inputs == null || settings == null) {
      throw new IllegalArgumentException("inputs and settings must not be null");
    }
    if (inputs.dataFiles().isEmpty()) {
      inputs.tables(inputs.parse()); // refuses a model that reads data from a file, naming it
    }
    List<DataText> data = new ArrayList<>();
    for (var file : inputs.dataFiles()) {
      data.add(DataText.read(file));
    }
    CalibrationTask task =
        new CalibrationTask(inputs.modelFile().toString(), inputs.modelText(), data, settings);
    task.calibration();
    return task;
  }

  /** The calibration, built from the texts on first use. */
  public Calibration calibration() {
    if (calibration == null) {
      ModelFile parsed = Parser.parse(SourceText.of(modelFileName, modelText));
      List<DataTable> tables = new ArrayList<>();
      for (DataText text : data) {
        tables.add(text.table(BoundModel.readsColumn(parsed)));
      }
      calibration = Calibration.of(parsed, tables, PosteriorFitter.gibbs());
    }
    return calibration;
  }

  @Override
  public Ranks run(Integer replicate) {
    return new Ranks(replicate, calibration().replicate(settings, replicate));
  }

  /**
   * Runs every replicate on {@code engine} and tests the ranks, as {@link Calibration#run} does
   * one replicate after another.
   */
  public CalibrationResult run(TaskEngine engine, TaskEngine.Progress progress) {
    List<Integer> replicates = new ArrayList<>();
    for (int n = 0; n < settings.replicates(); n++) {
      replicates.add(n);
    }
    List<Ranks> found = engine.run(replicates, this, progress);
    int[][] ranks = new int[found.size()][];
    for (Ranks replicate : found) {
      ranks[replicate.replicate()] = replicate.ranks();
    }
    return calibration().result(settings, ranks);
  }
}
