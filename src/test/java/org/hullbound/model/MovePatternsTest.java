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
  void aGroupModelGetsAShiftARescaleAndADirectionBlock() {
    BoundModel model = bind(CLINICS);
    List<Update> moves = model.moves();
    assertEquals(3, moves.size(), moves.toString());
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
    Update.DirectionBlock block = assertInstanceOf(Update.DirectionBlock.class, moves.get(2));
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
        // Jacobian times Haar measure dc / c: c^(d - 1) for c x
        double jacobian = !line.rescales() ? 0 : (line.members().length - 1) * Math.log(t);
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
    assertEquals(List.of(), groupMoves(model));
  }

  private static List<Update> groupMoves(BoundModel model) {
    return model.moves().stream().filter(m -> m instanceof Update.GroupMove).toList();
  }

  @Test
  void effectsAboutAnUnknownMeanRescaleAboutItWithTheJacobianOfARescaling() {
    BoundModel model = bind("""
        index group = 1 .. 3
        index row = 1 .. 4
        data group_of[row] = [1, 2, 3, 3]
        data n[row] = [12, 9, 14, 10]
        data y[row] = [5, 7, 3, 6] ~ binomial(trials = n[row], logit_p = effect[group_of[row]])
        param centre ~ normal(mean = 0, sd = 2)
        param spread ~ half-normal(sd = 1)
        param effect[group] ~ normal(mean = centre, sd = 0.5 * spread)
        """);
    Update.GroupMove rescale = groupMove(model, Update.MoveKind.RESCALE);
    assertTrue(rescale.logConcave(), rescale.reason());
    assertTrue(rescale.reason().contains("about centre (centre + c (effect[..] - centre))"),
        rescale.reason());
    assertTrue(rescale.reason().contains("the 3 normal priors whose value less their mean centre"
        + " and sd are both times c are -log c each"), rescale.reason());
    assertEquals(List.of(model.unknown("spread").index(), 2, 3, 4),
        java.util.Arrays.stream(rescale.members()).boxed().toList());
    LineDensity line = rescale.line();
    // the effects' priors are left out with as many powers of c: 4 data terms and spread's prior
    assertEquals(5, line.termCount());
    assertEquals(0, line.jacobianPower());
    double[] state = {0.6, 0.8, 0.1, 1.3, 0.4};
    double[] frame = new double[line.frameLength()];
    line.load(state, frame);
    double base = line.logDensity(1, frame, null);
    for (double c : new double[] {0.3, 1.7}) {
      double[] moved = state.clone();
      line.apply(c, moved, frame);
      // centre stays, spread and each effect's distance from centre times c
      assertEquals(0.6, moved[0]);
      assertEquals(c * 0.8, moved[1], 1e-12);
      assertEquals(c * (1.3 - 0.6), moved[3] - 0.6, 1e-12);
      // c^(d - 1) p(g_c x), d = 4: Liu and Sabatti 2000, scale group
      assertEquals(model.logDensity(moved) - model.logDensity(state) + 3 * Math.log(c),
          line.logDensity(c, frame, null) - base, 1e-9, "at " + c);
    }
    // near c = 0 the slope is the data's and spread's alone, not a difference of K / c terms
    double[] slope = new double[1];
    line.logDensity(1e-8, frame, slope);
    double difference = (line.logDensity(2e-8, frame, null) - line.logDensity(1e-9, frame, null))
        / 1.9e-8;
    assertEquals(difference, slope[0], 1e-4 * Math.max(1, Math.abs(difference)));
  }

  @Test
  void effectsAboutTheScaleOrAPositiveUnknownGetNoRescale() {
    for (String mean : new String[] {"spread", "level"}) {
      BoundModel model = bind("""
          index group = 1 .. 3
          index row = 1 .. 3
          data group_of[row] = [1, 2, 3]
          data y[row] = [0.5, 1.2, -0.3] ~ normal(mean = effect[group_of[row]], sd = 1)
          param level ~ half-normal(sd = 1)
          param spread ~ half-normal(sd = 1)
          param effect[group] ~ normal(mean = MEAN, sd = spread)
          """.replace("MEAN", mean));
      // c (e - m) with m moved too, or m not on the whole line: not the pattern proved
      assertEquals(List.of(), groupMoves(model), mean);
    }
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
