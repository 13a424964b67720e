package org.hullbound.gibbs;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.hullbound.diagnostics.PaperDiagnostics;
import org.hullbound.io.CsvData;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.junit.jupiter.api.Test;

/**
 * The diagnostics of real fit output agree to a relative 1e-10 with {@link PaperDiagnostics}, the
 * second implementation written in the tests from Vehtari, Gelman, Simpson, Carpenter and Buerkner
 * (2021): every unknown of a short fit of the demo model {@code models/seedlings.hbm} (4 chains
 * of 400 draws after 100 sweeps of burn-in, short enough that some unknowns are still correlated
 * and their R-hat is away from 1).
 */
class FitDiagnosticsAgreementTest {

  @Test
  void everyUnknownOfADemoFitGetsThePapersDiagnostics() throws IOException {
    Path modelFile = Path.of("models", "seedlings.hbm");
    BoundModel bound =
        BoundModel.bind(
            Parser.parse(
                SourceText.of(
                    modelFile.toString(), Files.readString(modelFile, StandardCharsets.UTF_8))),
            List.of(CsvData.read(Path.of("models", "seedlings.csv"))));
    GibbsSampler sampler = ModelSampler.of(bound, Map.of()).sampler();
    Fits.Fit fit = Fits.run(sampler, new RunSettings(4, 100, 400, 1, 20261202L, 2));
    for (int k = 0; k < sampler.dimension(); k++) {
      PaperDiagnostics.assertAgreement(fit.store().draws(k), "seedlings unknown " + k);
    }
  }
}
