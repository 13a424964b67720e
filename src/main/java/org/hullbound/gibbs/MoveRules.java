package org.hullbound.gibbs;

import org.hullbound.model.LineDensity;
import org.hullbound.model.Update;

/**
 * Turns a model's moves along lines ({@link org.hullbound.model.BoundModel#moves()}) into extra
 * update rules of the sweep, each seeing its line through the driver's {@link LineTarget}.
 */
final class MoveRules {
  private MoveRules() {}

  /** The rule of {@code move}, a group move or a direction block. */
  static UpdateRule of(Update move) {
    return move.accept(
        new Update.Visitor<UpdateRule>() {
          @Override
          public UpdateRule conjugate(Update.Conjugate update) {
            throw notAMove(update);
          }

          @Override
          public UpdateRule adaptiveRejection(Update.AdaptiveRejection update) {
            throw notAMove(update);
          }

          @Override
          public UpdateRule fallback(Update.Fallback update) {
            throw notAMove(update);
          }

          @Override
          public UpdateRule linearNormalBlock(Update.LinearNormalBlock update) {
            throw notAMove(update);
          }

          @Override
          public UpdateRule discrete(Update.Discrete update) {
            throw notAMove(update);
          }

          @Override
          public UpdateRule groupMove(Update.GroupMove update) {
            return new UpdateRule.Move(update.kind().word() + " move", target(update.line()),
                update.logConcave(), update.reason());
          }

          @Override
          public UpdateRule directionBlock(Update.DirectionBlock update) {
            return new UpdateRule.Move("direction block", target(update.line()),
                update.logConcave(), update.reason());
          }
        });
  }

  private static IllegalArgumentException notAMove(Update update) {
    return new IllegalArgumentException("move must be a group move or a direction block, got "
        + update.getClass().getSimpleName());
  }

  /** The model's line seen through the driver's narrow interface. */
  static LineTarget target(LineDensity line) {
    return new LineTarget() {
      @Override
      public int[] members() {
        return line.members();
      }

      @Override
      public int position() {
        return line.position();
      }

      @Override
      public int frameLength() {
        return line.frameLength();
      }

      @Override
      public boolean learned() {
        return line.learned();
      }

      @Override
      public void load(double[] state, double[] frame) {
        line.load(state, frame);
      }

      @Override
      public void direct(double[] direction, double[] frame) {
        line.direct(direction, frame);
      }

      @Override
      public double identity() {
        return line.identity();
      }

      @Override
      public double lower() {
        return line.lower();
      }

      @Override
      public double logDensity(double t, double[] frame, double[] slope) {
        return line.logDensity(t, frame, slope);
      }

      @Override
      public void apply(double t, double[] state, double[] frame) {
        line.apply(t, state, frame);
      }

      @Override
      public boolean smooth() {
        return line.smooth();
      }
    };
  }
}
