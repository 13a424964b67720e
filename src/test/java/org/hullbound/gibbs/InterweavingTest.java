package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import java.util.Map;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.junit.jupiter.api.Test;

/**
 * A hierarchical scale's own update comes after its effects' updates and right before the moves
 * when the moves are on (interweaving, Yu and Meng 2011), and in the declared order without them.
 */
class InterweavingTest {
  private static List<Integer> firstIndices(GibbsSampler sampler) {
    return sampler.rules().stream().map(rule -> rule.indices()[0]).toList();
  }

  @Test
  void theScaleIsDrawnAfterItsEffectsAndJustBeforeTheMoves() {
    BoundModel bound = BoundModel.bind(Parser.parse(SourceText.of("groups.hbm", """
        index group = 1 .. 3
        index row = 1 .. 6
        data group_of[row] = [1, 1, 2, 2, 3, 3]
        data ok[row] = [0, 1, 0, 1, 1, 1] ~ bernoulli(logit_p = intercept + effect[group_of[row]])
        param intercept ~ normal(mean = 0, sd = 2)
        param spread ~ half-normal(sd = 1)
        param effect[group] ~ normal(mean = 0, sd = spread)
        """)), List.of());
    int spread = bound.unknown("spread").index();
    assertEquals(1, spread);
    assertEquals(List.of(0, 1, 2, 3, 4),
        firstIndices(ModelSampler.withoutMoves(bound, Map.of()).sampler()));
    GibbsSampler interwoven = ModelSampler.of(bound, Map.of()).sampler();
    // intercept, the three effects, spread, then the shift and the rescale move
    assertEquals(List.of(0, 2, 3, 4, spread), firstIndices(interwoven).subList(0, 5));
    assertEquals(List.of(false, true, true),
        interwoven.rules().subList(4, 7).stream().map(UpdateRule::extra).toList());
  }
}
