package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.hullbound.model.TestModels.table;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertSame;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.junit.jupiter.api.Test;

/**
 * Linear-normal blocks against the closed form of Bayesian linear regression with known sigma
 * and an independent normal prior (Gelman et al., Bayesian Data Analysis, 3rd ed., section 14.2,
 * with the prior written as extra observations, section 14.8): posterior precision
 * {@code Q = X'X / sigma^2 + diag(1 / s^2)} and linear term {@code b = X'y / sigma^2 + m / s^2}.
 */
class LinearNormalBlocksTest {
  private static final String REGRESSION =
      String.join(
          "\n",
          "index obs",
          "index coef = 1 .. 2",
          "data X[obs, coef]",
          "data y[obs] ~ normal(mean = mu[obs], sd = 1.5)",
          "let mu[obs] = alpha + sum(coef: X[obs, coef] * beta[coef])",
          "param alpha ~ normal(mean = 1, sd = 10)",
          "param beta[coef] ~ normal(mean = 0.5, sd = 2)");

  // An invented design of five rows, with correlated covariates.
  private static final double[][] X = {
    {0.3, 0.5}, {1.2, 1.0}, {-0.7, -0.4}, {2.1, 1.8}, {0.0, 0.2}
  };
  private static final double[] Y = {1.9, 4.2, -0.3, 6.8, 1.1};

  static DataTable design() {
    String[] lines = new String[1 + Y.length];
    lines[0] = "X[1],X[2],y";
    for (int i = 0; i < Y.length; i++) {
      lines[1 + i] = X[i][0] + "," + X[i][1] + "," + Y[i];
    }
    return table("design.csv", lines);
  }

  @Test
  void regressionCoefficientsFormOneBlockWithTheClosedForm() {
    BoundModel model = bind(REGRESSION, design());
    int alpha = model.unknown("alpha").index();
    Update update = model.update(alpha);
    Update.LinearNormalBlock block = assertInstanceOf(Update.LinearNormalBlock.class, update,
        update.reason());
    assertEquals(3, block.size());
    assertSame(block, model.update(model.unknown("beta[2]").index()));
    assertArrayEquals(
        new int[] {alpha, model.unknown("beta[1]").index(), model.unknown("beta[2]").index()},
        block.members());

    // Design matrix with the intercept column: rows (1, x1, x2).
    double[][] design = new double[Y.length][3];
    for (int i = 0; i < Y.length; i++) {
      design[i] = new double[] {1, X[i][0], X[i][1]};
    }
    RealMatrix d = new Array2DRowRealMatrix(design);
    RealVector y = new ArrayRealVector(Y);
    double sigma2 = 1.5 * 1.5;
    RealMatrix q = d.transpose().multiply(d).scalarMultiply(1 / sigma2);
    double[] priorPrecision = {1 / 100.0, 1 / 4.0, 1 / 4.0};
    double[] priorMean = {1, 0.5, 0.5};
    RealVector b = d.transpose().operate(y).mapMultiply(1 / sigma2);
    for (int k = 0; k < 3; k++) {
      q.addToEntry(k, k, priorPrecision[k]);
      b.addToEntry(k, priorPrecision[k] * priorMean[k]);
    }
    // The canonical form must not depend on where the block currently is.
    double[] state = model.initialState();
    state[alpha] = 7.3;
    state[model.unknown("beta[1]").index()] = -4.1;
    Update.Canonical canonical = block.canonical(state);
    for (int i = 0; i < 3; i++) {
      assertEquals(b.getEntry(i), canonical.linear()[i], 1e-10, "b[" + i + "]");
      for (int j = 0; j < 3; j++) {
        assertEquals(q.getEntry(i, j), canonical.precision()[i][j], 1e-10,
            "Q[" + i + "][" + j + "]");
      }
    }
  }

  @Test
  void aSpreadReadingAMemberPreventsTheBlock() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [1.0, 2.0, 0.5] ~ normal(mean = a + b, sd = exp(b))",
                "param a ~ normal(mean = 0, sd = 1)",
                "param b ~ normal(mean = 0, sd = 1)"));
    assertFalse(model.update(model.unknown("a").index()) instanceof Update.LinearNormalBlock);
  }

  @Test
  void aProductOfMembersIsNotJointlyAffine() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [1.0, 2.0, 0.5] ~ normal(mean = a * b, sd = 1)",
                "param a ~ normal(mean = 0, sd = 1)",
                "param b ~ normal(mean = 0, sd = 1)"));
    // Each alone is conjugate; together they are not jointly normal.
    assertInstanceOf(Update.Conjugate.class, model.update(model.unknown("a").index()));
    assertInstanceOf(Update.Conjugate.class, model.update(model.unknown("b").index()));
  }

  @Test
  void repeatedIdenticalRowsEachCount() {
    // Two identical observations must both enter Q (terms are counted by position, not value).
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [2.0, 2.0] ~ normal(mean = a + b, sd = 1)",
                "param a ~ normal(mean = 0, sd = 1)",
                "param b ~ normal(mean = 0, sd = 1)"));
    Update.LinearNormalBlock block = assertInstanceOf(
        Update.LinearNormalBlock.class, model.update(model.unknown("a").index()));
    Update.Canonical c = block.canonical(model.initialState());
    // Q = [[1 + 2, 2], [2, 1 + 2]], b = (4, 4): the closed form above with X = [[1, 1], [1, 1]].
    assertEquals(3, c.precision()[0][0], 1e-12);
    assertEquals(2, c.precision()[0][1], 1e-12);
    assertEquals(4, c.linear()[1], 1e-12);
  }

  @Test
  void aHierarchicalNormalModelWithKnownSpreadsIsOneBlock() {
    // theta[j] ~ N(mu, 2^2), y[j] ~ N(theta[j], sd[j]^2), mu ~ N(0, 5^2): the joint log-density is
    // a quadratic form in (theta, mu) (BDA3 section 5.4 with tau known) whose precision has
    // 1/4 + 1/sd_j^2 on theta's diagonal, -1/4 between theta_j and mu, 1/25 + J/4 for mu, and
    // linear term y_j/sd_j^2 for theta_j, 0 for mu.
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index school = 1 .. 3",
                "data sd[school] = [1.0, 2.0, 4.0]",
                "data y[school] = [3.0, -1.0, 6.0] ~ normal(mean = theta[school], sd = sd[school])",
                "param mu ~ normal(mean = 0, sd = 5)",
                "param theta[school] ~ normal(mean = mu, sd = 2)"));
    Update.LinearNormalBlock block = assertInstanceOf(
        Update.LinearNormalBlock.class, model.update(model.unknown("mu").index()));
    assertEquals(4, block.size());
    Update.Canonical c = block.canonical(model.initialState());
    int mu = indexIn(block, model.unknown("mu").index());
    double[] sd = {1, 2, 4};
    double[] y = {3, -1, 6};
    assertEquals(1 / 25.0 + 3 / 4.0, c.precision()[mu][mu], 1e-12);
    assertEquals(0, c.linear()[mu], 1e-12);
    for (int j = 0; j < 3; j++) {
      int t = indexIn(block, model.unknown("theta[" + (j + 1) + "]").index());
      assertEquals(0.25 + 1 / (sd[j] * sd[j]), c.precision()[t][t], 1e-12);
      assertEquals(-0.25, c.precision()[t][mu], 1e-12);
      assertEquals(-0.25, c.precision()[mu][t], 1e-12);
      assertEquals(y[j] / (sd[j] * sd[j]), c.linear()[t], 1e-12);
    }
  }

  private static int indexIn(Update.LinearNormalBlock block, int slot) {
    int[] members = block.members();
    for (int p = 0; p < members.length; p++) {
      if (members[p] == slot) {
        return p;
      }
    }
    throw new AssertionError("slot " + slot + " is not in the block");
  }
}
