package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Stream;
import org.hullbound.io.Checkpoint;
import org.hullbound.io.CheckpointFile;
import org.hullbound.io.CsvData;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DemoModels;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Every sampler state of every demo in {@code models/} survives the checkpoint file: a run stopped
 * during burn-in (while the direction blocks measure their Hessian) and again after it (once the
 * direction blocks have fixed their directions and hand their members' draws over), each time
 * written to {@code checkpoint.txt} and read back, resumes to exactly the draws and final updater
 * states of the same run never stopped. The file must give back each chain's state equal to the
 * one saved (values by their bits, every updater's words and note) and write the same text again.
 *
 * <p>{@link ResumeExactnessTest} checks resumption in memory on a few models; this adds the file
 * and every demo, so that a new updater, move or cheap path whose state the file drops or whose
 * future draws depend on something it does not save fails here. The reference is the
 * uninterrupted run itself (the claim is identity); {@link #everyKindOfUpdaterIsCovered} checks
 * that the demos reach every kind of updater and move. The demos come from {@link DemoModels},
 * which {@code cli.DemoModelsFitTest} keeps equal to the models folder.
 */
class CheckpointRoundTripTest {
  private static final int BURN_IN = 40;

  private static final Map<String, List<String>> DEMOS = DemoModels.DATA_FILES;

  /** The updater methods met in the runs of this class (filled by the parameterised test). */
  private static final Set<String> METHODS = java.util.Collections.synchronizedSet(new TreeSet<>());

  /** The updater classes met in the runs of this class. */
  private static final Set<String> CLASSES = java.util.Collections.synchronizedSet(new TreeSet<>());

  @TempDir Path folder;

  static Stream<String> demos() {
    return DEMOS.keySet().stream().sorted();
  }

  private static GibbsSampler sampler(String demo) throws IOException {
    Path modelFile = Path.of("models", demo + ".hbm");
    List<org.hullbound.model.DataTable> data = new ArrayList<>();
    for (String file : DEMOS.get(demo)) {
      data.add(CsvData.read(Path.of("models", file)));
    }
    BoundModel bound =
        BoundModel.bind(
            Parser.parse(
                SourceText.of(
                    modelFile.toString(), Files.readString(modelFile, StandardCharsets.UTF_8))),
            data);
    return ModelSampler.of(bound, Map.of()).sampler().withAdaptation(BURN_IN);
  }

  /**
   * Stops after 35 sweeps of chain 1 (in the last 10 sweeps of burn-in, while the direction blocks
   * measure their conditional Hessian) and 15 sweeps later (after burn-in, the directions fixed),
   * writing and reading the checkpoint file at each stop, then runs to the end.
   */
  @ParameterizedTest(name = "{0}")
  @MethodSource("demos")
  void aRunResumedFromItsCheckpointFileMakesTheDrawsOfOneRun(String demo) throws IOException {
    GibbsSampler sampler = sampler(demo);
    RunSettings settings = new RunSettings(2, BURN_IN, 50, 1, 19L, 1);
    ResumeExactnessTest.Rows whole = new ResumeExactnessTest.Rows(2);
    RunOutcome reference =
        ChainRunner.of(settings, ProgressListener.none(), StopSignal.create()).run(sampler, whole);
    assertFalse(reference.stoppedEarly());
    for (ChainKernel kernel : reference.kernels()) {
      for (Updater updater : ((GibbsKernel) kernel).updaters()) {
        METHODS.add(updater.method());
        CLASSES.add(updater.getClass().getName());
      }
    }

    ResumeExactnessTest.Rows pieces = new ResumeExactnessTest.Rows(2);
    List<ChainState> saved = List.of();
    RunOutcome last = null;
    for (long stopAfter : new long[] {35, 15, 0}) {
      StopSignal stop = StopSignal.create();
      last =
          ChainRunner.of(settings, ProgressListener.none(), stop)
              .resume(ResumeExactnessTest.stoppingAfter(sampler, stopAfter, stop), pieces, saved);
      if (stopAfter == 0) {
        break;
      }
      assertTrue(last.stoppedEarly(), demo + " stopped after " + stopAfter);
      saved = throughTheFile(demo, last.chainStates());
    }
    assertFalse(last.stoppedEarly());
    for (int chain = 0; chain < 2; chain++) {
      assertEquals(settings.draws(), whole.perChain.get(chain).size());
      assertEquals(whole.perChain.get(chain), pieces.perChain.get(chain), demo + " chain " + (chain + 1));
      assertEquals(
          ((ResumableKernel) reference.kernels().get(chain)).save(),
          last.chainStates().get(chain).kernel(),
          demo + " chain " + (chain + 1) + ": updaters end in the same state");
    }
  }

  /** {@code states} written to checkpoint.txt and read back, checked equal on the way. */
  private List<ChainState> throughTheFile(String demo, List<ChainState> states) {
    Checkpoint written =
        new Checkpoint(
            false, "models/" + demo + ".hbm", CheckpointFile.inputHash(demo, List.of()), 19L,
            BURN_IN, 50, 1, List.of("x"), states);
    Path dir = folder.resolve(demo);
    CheckpointFile.write(dir, written);
    Checkpoint read = CheckpointFile.read(dir);
    for (int chain = 0; chain < states.size(); chain++) {
      ChainState before = states.get(chain);
      ChainState after = read.chains().get(chain);
      assertEquals(before.sweep(), after.sweep());
      assertEquals(before.draws(), after.draws());
      assertArrayEquals(before.generator(), after.generator());
      assertEquals(before.kernel(), after.kernel(), demo + ": every value and updater state");
      for (int k = 0; k < before.kernel().updaters().size(); k++) {
        UpdaterState a = before.kernel().updaters().get(k);
        UpdaterState b = after.kernel().updaters().get(k);
        assertTrue(Arrays.equals(a.words(), b.words()) && java.util.Objects.equals(a.note(), b.note()),
            demo + ": updater " + (k + 1));
      }
    }
    try {
      String text = Files.readString(CheckpointFile.in(dir), StandardCharsets.UTF_8);
      CheckpointFile.write(dir, read);
      assertEquals(text, Files.readString(CheckpointFile.in(dir), StandardCharsets.UTF_8),
          demo + ": the file read and written again is the same text");
    } catch (IOException e) {
      throw new java.io.UncheckedIOException(e);
    }
    return read.chains();
  }

  /**
   * The demos reach every kind of updater (the sealed {@link Updater}'s permitted classes), the
   * discrete draws both ways and every move along lines; runs after the parameterised test.
   */
  @AfterAll
  static void everyKindOfUpdaterIsCovered() {
    if (METHODS.isEmpty()) {
      return; // the parameterised test did not run (a single test selected)
    }
    TreeSet<String> permitted = new TreeSet<>();
    for (Class<?> kind : Updater.class.getPermittedSubclasses()) {
      permitted.add(kind.getName());
    }
    assertEquals(permitted, CLASSES, "the demos reach every kind of updater");
    String all = String.join("; ", METHODS);
    for (String kind :
        List.of("ARMS", "direction block", "shift move", "rescale move",
            "enumeration", "integer hull")) {
      assertTrue(all.contains(kind), "no demo has a '" + kind + "' updater: " + all);
    }
  }
}
