package org.hullbound.anchor;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.junit.jupiter.api.Test;

/**
 * The hand-fused clinics target is {@link ModelTarget} on the same coordinates: at scattered
 * positions its value differs from {@link ModelTarget}'s by one constant and its gradient equals
 * {@link ModelTarget}'s, on the {@code clinics} demo (1,200 patients, 36 clinics) and on a small
 * grown clinics (6,000 patients, 400 clinics, generated here with a fixed seed as {@code
 * gibbs.GrownClinics} does), the patients of one clinic and dose summed into groups or each on its
 * own. {@link ModelTarget} itself is checked against closed forms and finite differences ({@code
 * ModelTargetTest}), so this ties the fused target to the model's own densities (the model
 * language's normal, half-normal and Bernoulli, tested against commons-math3) rather than to a
 * second hand derivation.
 *
 * <p>Tolerance: 1e-9 of max(1, |x|), value differences and gradient coordinates alike (common
 * practice: the two sum tens of thousands of terms in different orders, so they differ by rounding,
 * about 1e-16 per term, nowhere near 1e-9). Deterministic. Broken on purpose: the spread's
 * Jacobian left out of the value (the {@code + u}), the constant check failed; the sign of the
 * dose's term in the slope's gradient flipped, the gradient check failed on the slope; the
 * effects' prior precision taken as {@code exp(-u)}, both failed.
 */
class FusedClinicsTargetTest {
  private static final double TOLERANCE = 1e-9;

  @Test
  void demoClinicsGrouped() {
    DataTable data = AnchorModels.demoData("clinics");
    BoundModel model = AnchorModels.withData("clinics", AnchorModels.demoText("clinics"), data);
    FusedClinicsTarget fused = FusedClinicsTarget.of(model, data);
    // 36 clinics, 31 doses: 1,200 patients fall in fewer (clinic, dose) groups
    assertTrue(fused.groupCount() < 1_200, "groups " + fused.groupCount());
    assertSameTarget(model, fused);
  }

  @Test
  void demoClinicsRowByRow() {
    DataTable data = AnchorModels.demoData("clinics");
    BoundModel model = AnchorModels.withData("clinics", AnchorModels.demoText("clinics"), data);
    FusedClinicsTarget fused = FusedClinicsTarget.rowByRow(model, data);
    assertEquals(1_200, fused.groupCount());
    assertSameTarget(model, fused);
  }

  @Test
  void smallGrownClinicsGroupedAndRowByRow() {
    DataTable data = grownData(400, 6_000);
    String text = AnchorModels.demoText("clinics").replace("model clinics", "model small_grown")
        .replace("index clinic = 1 .. 36", "index clinic = 1 .. 400");
    BoundModel model = AnchorModels.withData("clinics_small_grown", text, data);
    assertEquals(403, model.unknowns().size());
    assertSameTarget(model, FusedClinicsTarget.of(model, data));
    assertSameTarget(model, FusedClinicsTarget.rowByRow(model, data));
  }

  @Test
  void noDensityWhereTheSpreadOverflows() {
    DataTable data = AnchorModels.demoData("clinics");
    BoundModel model = AnchorModels.withData("clinics", AnchorModels.demoText("clinics"), data);
    FusedClinicsTarget fused = FusedClinicsTarget.of(model, data);
    ModelTarget reference = ModelTarget.of(model);
    int spread = model.unknown("spread").index();
    double[] gradient = new double[fused.dimension()];
    for (double u : new double[] {800, -800, Double.NaN}) {
      double[] position = reference.toSamplingScale(model.initialState());
      position[spread] = u;
      assertEquals(Double.NEGATIVE_INFINITY, fused.logDensity(position, gradient), "u = " + u);
    }
  }

  @Test
  void refusesAnotherModelOrData() {
    DataTable data = AnchorModels.demoData("clinics");
    BoundModel clinics =
        AnchorModels.withData("clinics", AnchorModels.demoText("clinics"), data);
    BoundModel seedlings = AnchorModels.demo("seedlings");
    IllegalArgumentException wrongModel = assertThrows(IllegalArgumentException.class,
        () -> FusedClinicsTarget.of(seedlings, data));
    assertTrue(wrongModel.getMessage().contains("clinics model's unknowns"),
        wrongModel.getMessage());
    DataTable noDose = DataTable.of("no_dose.csv", List.of("clinic_of", "recovered"),
        List.of(List.of("1", "0")));
    IllegalArgumentException missing = assertThrows(IllegalArgumentException.class,
        () -> FusedClinicsTarget.of(clinics, noDose));
    assertEquals("no_dose.csv has no column dose", missing.getMessage());
    DataTable farClinic = DataTable.of("far.csv", List.of("clinic_of", "dose", "recovered"),
        List.of(List.of("1", "0.5", "1"), List.of("37", "0.5", "1")));
    IllegalArgumentException outOfRange = assertThrows(IllegalArgumentException.class,
        () -> FusedClinicsTarget.rowByRow(clinics, farClinic));
    assertTrue(outOfRange.getMessage().startsWith("far.csv line 3: expected a clinic in 1..36"),
        outOfRange.getMessage());
  }

  /**
   * At the initial state and 6 positions scattered about it (0.5 standard normal on every
   * coordinate, the spread's log included), fused minus model value is one constant and the
   * gradients agree coordinate by coordinate.
   */
  private static void assertSameTarget(BoundModel model, Target fused) {
    ModelTarget reference = ModelTarget.of(model);
    int n = reference.dimension();
    assertEquals(n, fused.dimension());
    double[] centre = reference.toSamplingScale(model.initialState());
    SplittableRandom random = new SplittableRandom(20261203L);
    double[] expected = new double[n];
    double[] actual = new double[n];
    double constant = Double.NaN;
    for (int point = 0; point < 7; point++) {
      double[] u = centre.clone();
      for (int i = 0; point > 0 && i < n; i++) {
        u[i] += 0.5 * random.nextGaussian();
      }
      double modelValue = reference.logDensity(u, expected);
      double fusedValue = fused.logDensity(u, actual);
      assertTrue(Double.isFinite(modelValue) && Double.isFinite(fusedValue),
          model.name() + ": values at point " + point);
      double difference = fusedValue - modelValue;
      if (point == 0) {
        constant = difference;
      } else {
        assertEquals(constant, difference, TOLERANCE * Math.max(1, Math.abs(modelValue)),
            model.name() + ": fused minus model value at point " + point);
      }
      for (int i = 0; i < n; i++) {
        assertEquals(expected[i], actual[i], TOLERANCE * Math.max(1, Math.abs(expected[i])),
            model.name() + ": d/du of " + model.unknowns().get(i).label() + " at point " + point);
      }
    }
  }

  /**
   * Clinics' invented scenario (intercept -0.3, dose slope 0.9 per unit, doses 0 to 3 in tenths,
   * clinic spread 0.7 on the logit scale), {@code patients} rows over {@code clinics} clinics.
   */
  static DataTable grownData(int clinics, int patients) {
    SplittableRandom random = new SplittableRandom(20261202L);
    double[] effect = new double[clinics];
    for (int c = 0; c < clinics; c++) {
      effect[c] = 0.7 * random.nextGaussian();
    }
    List<List<String>> rows = new ArrayList<>(patients);
    for (int patient = 0; patient < patients; patient++) {
      int clinic = random.nextInt(clinics);
      int doseTenths = random.nextInt(31);
      double logit = -0.3 + 0.09 * doseTenths + effect[clinic];
      int recovered = random.nextDouble() < 1 / (1 + Math.exp(-logit)) ? 1 : 0;
      String dose = doseTenths / 10 + "." + doseTenths % 10;
      rows.add(List.of(Integer.toString(clinic + 1), dose, Integer.toString(recovered)));
    }
    return DataTable.of("clinics_small_grown.csv", List.of("clinic_of", "dose", "recovered"),
        rows);
  }
}
