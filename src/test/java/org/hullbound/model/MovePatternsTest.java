package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The moves along lines are found from the model's structure, refused where the pattern does not
 * hold, proved log-concave only where the rules allow, and their line densities agree with the
 * model's joint log-density (an independent evaluation of every term): along a translation
 * {@code log p(x + t w) - log p(x)}, along a rescaling that plus {@code (d - 1) log c}, the
 * Jacobian {@code c^d} times the Haar measure {@code dc / c} (Liu and Sabatti 2000).
 */
class MovePatternsTest {
  /** A clinics-like logistic model: intercept + slope * dose + effect[group]. */
  private static final String CLINICS = """
      index group = 1 .. 3
      index row = 1 .. 6
      data group_of[row] = [1, 1, 2, 2, 3, 3]
      data dose[row] = [4.0, 5.5, 4.5, 6.0, 5.0, 6.5]
      let eta[row] = intercept + slope * dose[row] + effect[group_of[row]]
      data ok[row] = [0, 1, 0, 1, 1, 1] ~ bernoulli(logit_p = eta[row])
      param intercept ~ normal(mean = 0, sd = 2)
      param slope ~ normal(mean = 0, sd = 1)
      param spread ~ half-normal(sd = 1)
      param effect[group] ~ normal(mean = 0, sd = spread)
      """;

  private static Update.GroupMove groupMove(BoundModel model, Update.MoveKind kind) {
    return model.moves().stream()
        .filter(m -> m instanceof Update.GroupMove g && g.kind() == kind)
        .map(Update.GroupMove.class::cast).findFirst().orElseThrow();
  }

  @Test
  void aGroupModelGetsAShiftTwoRescalesAndADirectionBlock() {
    BoundModel model = bind(CLINICS);
    List<Update> moves = model.moves();
    assertEquals(4, moves.size(), moves.toString());
    Update.GroupMove shift = assertInstanceOf(Update.GroupMove.class, moves.get(0));
    assertEquals(Update.MoveKind.SHIFT, shift.kind());
    assertTrue(shift.logConcave(), shift.reason());
    assertTrue(shift.reason().contains("each of the 6 terms that read them reads intercept"
        + " + effect[..] and stays unchanged"), shift.reason());
    // only the priors move along a shift: 1 + 3 terms compiled
    assertEquals(4, shift.line().termCount());
    Update.GroupMove rescale = assertInstanceOf(Update.GroupMove.class, moves.get(1));
    assertEquals(Update.MoveKind.RESCALE, rescale.kind());
    assertTrue(rescale.logConcave(), rescale.reason());
    assertTrue(rescale.reason().contains("the 3 normal priors with mean 0 and value and sd both"
        + " times c are -log c each, which cancels 3 of the 3 log c of the Jacobian"),
        rescale.reason());
    Update.GroupMove centred = assertInstanceOf(Update.GroupMove.class, moves.get(2));
    assertEquals(Update.MoveKind.RESCALE_ABOUT_MEAN, centred.kind());
    assertTrue(centred.logConcave(), centred.reason());
    assertTrue(centred.reason().contains("c drawn from c^3 p(g_c x), the Jacobian c^4 times the"
        + " Haar measure dc / c"), centred.reason());
    assertEquals(List.of(model.unknown("intercept").index(), model.unknown("spread").index(),
        3, 4, 5), java.util.Arrays.stream(centred.members()).boxed().toList());
    Update.DirectionBlock block = assertInstanceOf(Update.DirectionBlock.class, moves.get(3));
    assertTrue(block.logConcave(), block.reason());
    assertTrue(block.reason().contains("jointly affine in the moved unknowns"), block.reason());
    assertEquals(List.of(model.unknown("intercept").index(), model.unknown("slope").index()),
        java.util.Arrays.stream(block.members()).boxed().toList());
  }

  @Test
  void eachLineDensityDiffersFromTheJointByItsJacobianOnly() {
    BoundModel model = bind(CLINICS);
    double[] state = {-0.4, 0.3, 0.8, 0.5, -0.2, 0.1};
    for (Update move : model.moves()) {
      LineDensity line = move instanceof Update.GroupMove g ? g.line()
          : ((Update.DirectionBlock) move).line();
      double[] frame = new double[line.frameLength()];
      line.load(state, frame);
      if (line.learned()) {
        double[] direction = new double[line.members().length];
        for (int k = 0; k < direction.length; k++) {
          direction[k] = 0.7 - 0.4 * k;
        }
        line.direct(direction, frame);
      }
      double base = line.logDensity(line.identity(), frame, null);
      for (double t : new double[] {0.3, 0.8, 1.7}) {
        double[] moved = state.clone();
        line.apply(t, moved, frame);
        // Jacobian times Haar measure dc / c: c^(d - 1) for c x; for the rescale about the
        // mean, whose linear map is triangular with one unit diagonal entry, c^(d - 2)
        double jacobian = !line.rescales() ? 0
            : (line.members().length - (centredRescale(move) ? 2 : 1)) * Math.log(t);
        assertEquals(model.logDensity(moved) - model.logDensity(state) + jacobian,
            line.logDensity(t, frame, null) - base, 1e-9, move.reason() + " at " + t);
        // the slope against a central difference
        double h = 1e-6;
        double[] slope = new double[1];
        line.logDensity(t, frame, slope);
        double difference = (line.logDensity(t + h, frame, null)
            - line.logDensity(t - h, frame, null)) / (2 * h);
        assertEquals(difference, slope[0], 1e-5 * Math.max(1, Math.abs(difference)));
      }
    }
  }

  private static boolean centredRescale(Update move) {
    return move instanceof Update.GroupMove g && g.kind() == Update.MoveKind.RESCALE_ABOUT_MEAN;
  }

  @Test
  void theRescaleAboutTheMeanKeepsEveryGroupLevelsAverage() {
    BoundModel model = bind(CLINICS);
    Update.GroupMove centred = groupMove(model, Update.MoveKind.RESCALE_ABOUT_MEAN);
    LineDensity line = centred.line();
    double[] state = {-0.4, 0.3, 0.8, 0.5, -0.2, 0.1};
    double[] frame = new double[line.frameLength()];
    line.load(state, frame);
    for (double c : new double[] {0.3, 1.7}) {
      double[] moved = state.clone();
      line.apply(c, moved, frame);
      // intercept + mean(effect) stays; each effect's deviation from the mean times c
      assertEquals(-0.4 + 0.4 / 3, moved[0] + (moved[3] + moved[4] + moved[5]) / 3, 1e-12);
      assertEquals(c * (0.5 - 0.4 / 3), moved[3] - (moved[3] + moved[4] + moved[5]) / 3, 1e-12);
      assertEquals(c * 0.8, moved[2], 1e-12);
      assertEquals(0.3, moved[1]);
    }
  }

  @Test
  void effectsWithANonZeroPriorMeanGetNoRescaleAndAPartialOffsetNoShift() {
    BoundModel model = bind("""
        index group = 1 .. 3
        index row = 1 .. 4
        data group_of[row] = [1, 2, 3, 3]
        data y[row] = [0.5, 1.2, -0.3, 0.2] ~ normal(mean = a * 2 + effect[group_of[row]], sd = 1)
        param a ~ normal(mean = 0, sd = 2)
        param spread ~ half-normal(sd = 1)
        param effect[group] ~ normal(mean = 1, sd = spread)
        """);
    assertEquals(List.of(), model.moves().stream()
        .filter(m -> m instanceof Update.GroupMove).toList());
  }

  @Test
  void aLikelihoodNotConcaveAlongTheLineLeavesTheMoveToTheFallback() {
    BoundModel model = bind("""
        index group = 1 .. 2
        index row = 1 .. 4
        data group_of[row] = [1, 1, 2, 2]
        data y[row] = [0.5, 1.2, -0.3, 4.2] ~ student-t(df = 3, location = mu + effect[group_of[row]], scale = 1)
        param mu ~ normal(mean = 0, sd = 2)
        param spread ~ half-normal(sd = 1)
        param effect[group] ~ normal(mean = 0, sd = spread)
        """);
    Update.GroupMove rescale = groupMove(model, Update.MoveKind.RESCALE);
    assertFalse(rescale.logConcave(), rescale.reason());
    assertTrue(rescale.reason().contains("not provably log-concave along the line: student-t is"
        + " not concave in location"), rescale.reason());
    Update.GroupMove shift = groupMove(model, Update.MoveKind.SHIFT);
    // the shift leaves the student-t terms alone: only normal priors move
    assertTrue(shift.logConcave(), shift.reason());
  }
}
