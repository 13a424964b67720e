package org.hullbound.report;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import org.hullbound.diagnostics.Draws;

/**
 * Finds chains that sit on different labellings of a mixture's components: the elements of a name
 * selected through an unknown index ({@code centre[cohort_of[i]]}) are exchangeable when their
 * priors are, so one chain may settle with {@code centre[1] < centre[2]} and another with the
 * reverse. R-hat then compares different components and reports disagreement, although each chain
 * may be fine (label switching; Stephens 2000, J. R. Statist. Soc. B 62(4), and Jasra, Holmes and
 * Stephens 2005, Statistical Science 20(1), describe the problem).
 *
 * <p>The rule: for each group of components, order its members by their mean in each chain; when
 * two chains order them differently and some member's R-hat flags disagreement, the group's
 * disagreement verdicts are replaced by one label-switching verdict per member that names the
 * orderings. Chains that agree on the ordering keep the usual verdicts (their disagreement is not
 * explained by labels).
 */
public final class LabelSwitching {

  private LabelSwitching() {}

  /**
   * The ordering of {@code members} in each chain: element {@code c} lists the members' positions
   * by increasing chain mean in chain {@code c}; {@code null} when a member has no draws or the
   * chain counts differ.
   */
  static int[][] orderings(List<String> members, Map<String, Draws> draws) {
    int chains = -1;
    double[][] means = new double[members.size()][];
    for (int m = 0; m < members.size(); m++) {
      Draws d = draws.get(members.get(m));
      if (d == null || (chains >= 0 && d.chainCount() != chains)) {
        return null;
      }
      chains = d.chainCount();
      means[m] = Answers.chainMeans(d);
    }
    if (chains < 2) {
      return null;
    }
    int[][] orders = new int[chains][];
    for (int c = 0; c < chains; c++) {
      int chain = c;
      orders[c] = java.util.stream.IntStream.range(0, members.size()).boxed()
          .sorted(Comparator.comparingDouble(m -> means[m][chain]))
          .mapToInt(Integer::intValue).toArray();
    }
    return orders;
  }

  /**
   * {@code verdicts} with label switching named where it explains a disagreement (see the class
   * comment); {@code components} lists each group's member labels.
   */
  static List<Verdict> apply(
      List<Verdict> verdicts, List<List<String>> components, Map<String, Draws> draws) {
    return apply(verdicts, components, draws, Double.NaN);
  }

  /**
   * {@code verdicts} with label switching named where the draws alone show it, for a draws file
   * read without its model ({@code summarize}, {@code report DIR}): every name with two or more
   * elements of one index whose draws are not all whole numbers (allocations and counts are not
   * components) is a candidate group, and the rule of the class comment applies with one more
   * condition, since a group read this way need not be a mixture's: relabelled in each chain by
   * the order of its members' means (an ordering constraint imposed after the run; Stephens 2000
   * discusses such relabelling), every rank's draws must agree across chains (R-hat at most
   * {@code maxRhat}). Chains that disagree for another reason keep their verdicts.
   */
  static List<Verdict> applyFromDraws(
      List<Verdict> verdicts, List<String> labels, Map<String, Draws> draws, double maxRhat) {
    Map<String, List<String>> groups = new java.util.LinkedHashMap<>();
    for (String label : labels) {
      int open = label.indexOf('[');
      if (open > 0 && label.endsWith("]")
          && label.substring(open + 1, label.length() - 1).matches("[0-9]+")
          && draws.get(label) != null && !wholeNumbers(draws.get(label))) {
        groups.computeIfAbsent(label.substring(0, open), k -> new ArrayList<>()).add(label);
      }
    }
    return apply(verdicts, List.copyOf(groups.values()), draws, maxRhat);
  }

  private static boolean wholeNumbers(Draws d) {
    for (int c = 0; c < d.chainCount(); c++) {
      for (double x : d.chain(c)) {
        if (x != Math.rint(x)) {
          return false;
        }
      }
    }
    return true;
  }

  /**
   * Whether the group's draws agree across chains once each chain's members are relabelled by
   * the order of their means: R-hat (rank-normalised, split) of each rank at most {@code
   * maxRhat}.
   */
  private static boolean relabelledAgree(
      List<String> group, int[][] orders, Map<String, Draws> draws, double maxRhat) {
    for (int rank = 0; rank < group.size(); rank++) {
      double[][] chains = new double[orders.length][];
      for (int c = 0; c < orders.length; c++) {
        chains[c] = draws.get(group.get(orders[c][rank])).chain(c);
      }
      Draws relabelled = Draws.of(chains);
      if (!relabelled.isFinite() || relabelled.length() < 4) {
        return false;
      }
      double rhat = org.hullbound.diagnostics.Rhat.rankNormalized(relabelled).max();
      if (!(rhat <= maxRhat)) {
        return false;
      }
    }
    return true;
  }

  /** As above; a finite {@code maxRhat} asks that relabelled chains agree. */
  private static List<Verdict> apply(List<Verdict> verdicts, List<List<String>> components,
      Map<String, Draws> draws, double maxRhat) {
    List<Verdict> result = new ArrayList<>(verdicts);
    for (List<String> group : components) {
      if (group.size() < 2) {
        continue;
      }
      boolean disagree = result.stream().anyMatch(
          v -> v.kind() == Verdict.Kind.CHAINS_DISAGREE && group.contains(v.unknown()));
      int[][] orders = disagree ? orderings(group, draws) : null;
      if (orders == null
          || (!Double.isNaN(maxRhat) && !relabelledAgree(group, orders, draws, maxRhat))) {
        continue;
      }
      int other = -1;
      for (int c = 1; c < orders.length && other < 0; c++) {
        if (!Arrays.equals(orders[c], orders[0])) {
          other = c;
        }
      }
      if (other < 0) {
        continue;
      }
      String text = ": the chains sit on different labellings of the components "
          + String.join(", ", group) + " (label switching: chain 1 has "
          + ordered(group, orders[0]) + ", chain " + (other + 1) + " "
          + ordered(group, orders[other]) + "), so R-hat compares different components rather"
          + " than showing a failure to converge, and quantities tied to the labels (the"
          + " allocations, the shares) switch with them; give the components priors that tell them"
          + " apart (or an ordering), or read each chain on its own";
      int at = result.size();
      for (int i = 0; i < result.size(); i++) {
        if (group.contains(result.get(i).unknown())) {
          at = Math.min(at, i);
        }
      }
      result.removeIf(v -> v.kind() == Verdict.Kind.CHAINS_DISAGREE
          && group.contains(v.unknown()));
      at = Math.min(at, result.size());
      List<Verdict> added = new ArrayList<>();
      for (String member : group) {
        added.add(new Verdict(member, Verdict.Kind.LABEL_SWITCHING, member + text));
      }
      result.addAll(at, added);
    }
    return List.copyOf(result);
  }

  private static String ordered(List<String> group, int[] order) {
    List<String> names = new ArrayList<>();
    for (int m : order) {
      names.add(group.get(m));
    }
    return String.join(" < ", names);
  }
}
