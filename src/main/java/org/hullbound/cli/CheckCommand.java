package org.hullbound.cli;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.hullbound.app.ImputedCells;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataSummary;
import org.hullbound.model.DerivedQuantities;
import org.hullbound.model.IndexSet;
import org.hullbound.model.TestQuantities;
import org.hullbound.model.Unknown;
import org.hullbound.model.Update;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;

/**
 * {@code hullbound check MODEL [--data FILE]...}: parses and binds a model and prints its graph,
 * every unknown with its sampling scale and the update the Gibbs driver will give it, and what
 * data was read, without sampling anything.
 *
 * <p>The first thing to run on a new model: every model or data error shows here, positioned,
 * and the reasons say which unknowns get exact draws and which need a fallback sampler.
 */
@Command(
    name = "check",
    mixinStandardHelpOptions = true,
    description =
        "Parse and bind a model with its data, and print its graph: every unknown with its"
            + " sampling scale, the update it will get and why, and the data that was read.")
public final class CheckCommand implements Callable<Integer> {

  @Mixin ModelOptions inputs;

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  @Override
  public Integer call() {
    BoundModel model = inputs.inputs().bind();
    PrintWriter out = spec.commandLine().getOut();
    print(model, inputs.modelFile.toString(), out);
    out.flush();
    return 0;
  }

  /** Prints the layout of {@code check} for {@code model}. */
  static void print(BoundModel model, String file, PrintWriter out) {
    out.printf("model %s  (%s)%n", model.name(), file);
    out.println();
    out.println("data read");
    if (model.data().isEmpty()) {
      out.println("  (none)");
    }
    for (DataSummary d : model.data()) {
      String missing = d.missingCells() == 0 ? "" : "; " + d.missingCells() + " missing, imputed";
      if (d.source().equals("inline")) {
        out.printf(
            "  inline %s %s: %d value%s%s%n",
            String.join(", ", d.columns()),
            d.indexSet(),
            d.rows(),
            d.rows() == 1 ? "" : "s",
            missing);
      } else if (d.indexSet().equals(DataSummary.SCALARS)) {
        out.printf("  %s: one row of scalars; columns %s%s%n",
            d.source(), String.join(", ", d.columns()), missing);
      } else {
        out.printf(
            "  %s: %d rows over %s; columns %s%s%n",
            d.source(),
            d.rows(),
            d.indexSet(),
            String.join(", ", d.columns()),
            missing);
      }
    }
    for (String imputed : ImputedCells.of(model)) {
      out.println("  " + imputed);
    }
    out.println();
    out.println("index sets");
    int width = 0;
    int rangeWidth = 0;
    for (IndexSet set : model.indexSets()) {
      width = Math.max(width, set.name().length());
      rangeWidth = Math.max(rangeWidth, set.range().length());
    }
    for (IndexSet set : model.indexSets()) {
      out.printf(
          "  %-" + width + "s  %-" + rangeWidth + "s  (%d elements, %s)%n",
          set.name(),
          set.range(),
          set.size(),
          set.origin().equals("declared") ? "declared" : "from " + set.origin());
    }
    out.println();
    out.printf(
        "graph: %d data, %d param, %d let; %d scalar unknown%s; %d terms in the joint density%n",
        model.nodeCounts().getOrDefault("data", 0),
        model.nodeCounts().getOrDefault("param", 0),
        model.nodeCounts().getOrDefault("let", 0),
        model.unknowns().size(),
        model.unknowns().size() == 1 ? "" : "s",
        model.termCount());
    out.println();
    out.println("unknowns: scale, update, terms in the conditional; then why");
    if (model.unknowns().isEmpty()) {
      out.println("  none: the model has no param and no missing data, so fit has nothing to draw");
    }
    List<List<Unknown>> groups = groups(model);
    int labelWidth = 0;
    for (List<Unknown> group : groups) {
      labelWidth = Math.max(labelWidth, label(group).length());
    }
    for (List<Unknown> group : groups) {
      Unknown first = group.get(0);
      Update update = model.update(first.index());
      int fewest = Integer.MAX_VALUE;
      int most = 0;
      for (Unknown u : group) {
        int n = model.dependentCount(u.index()) + 1;
        fewest = Math.min(fewest, n);
        most = Math.max(most, n);
      }
      out.printf(
          "  %-" + labelWidth + "s  %-7s  %-30s  %s%n",
          label(group),
          first.scale().name().toLowerCase(Locale.ROOT),
          updateName(update),
          (fewest == most ? Integer.toString(most) : fewest + "-" + most)
              + (most == 1 ? " term" : " terms")
              + (group.size() > 1 ? " each, " + group.size() + " unknowns" : "")
              + (first.imputed() ? ", missing data" : "")
              + (model.dynamicBlanket(first.index()) ? ", dynamic blanket" : ""));
      out.printf("  %-" + labelWidth + "s    %s%n", "", update.reason());
      if (model.dynamicBlanket(first.index())) {
        boolean exact = update instanceof Update.Conjugate
            || update instanceof Update.LinearNormalBlock;
        out.printf("  %-" + labelWidth + "s    %s%n", "", "dynamic blanket: the terms that reach"
            + " it through an unknown index are candidates; "
            + (exact ? "in the exact draw a candidate whose index selects another element adds"
                + " nothing (its coefficient is 0)"
                : "a draw evaluates its own term, the other dependents and the candidates whose"
                + " index currently selects it"));
      }
      if (model.allocation(first.index())) {
        out.printf("  %-" + labelWidth + "s    %s%n", "", "an unknown index (an allocation):"
            + " each value of its support selects an element; enumerated with the term it selects");
      }
    }
    printMoves(model, out);
    printDerived(model.derived(), out);
    printTestQuantities(TestQuantities.of(model), out);
  }

  /** Each let, whether its values go with the draws (a column of draws.csv each) and why. */
  private static void printDerived(DerivedQuantities derived, PrintWriter out) {
    if (derived.choices().isEmpty()) {
      return;
    }
    out.println();
    out.println("lets: kept with the draws or not; why");
    int nameWidth = 0;
    for (DerivedQuantities.Choice choice : derived.choices()) {
      nameWidth = Math.max(nameWidth, choice.name().length());
    }
    for (DerivedQuantities.Choice choice : derived.choices()) {
      String kept = choice.kept()
          ? "kept" + (choice.elements() > 1 ? " (" + choice.elements() + " columns)" : "")
          : "not kept";
      out.printf("  %-" + nameWidth + "s  %-18s  %s%n", choice.name(), kept, choice.why());
    }
  }

  /** What {@code fit --replicate-checks} would compare, per modelled data name. */
  private static void printTestQuantities(TestQuantities tests, PrintWriter out) {
    out.println();
    out.println(
        "posterior predictive checks (fit --replicate-checks): test quantities per modelled data");
    if (tests.quantities().isEmpty()) {
      out.println("  none: the model has no observed modelled data");
      return;
    }
    for (TestQuantities.CheckedNode node : tests.nodes()) {
      List<String> names = new ArrayList<>();
      for (TestQuantities.Quantity q : tests.quantities()) {
        if (q.node().equals(node.name())) {
          names.add(q.statistic() + (q.fromModelFile() ? " (check)" : ""));
        }
      }
      out.printf("  %s ~ %s, %d observed%s: %s%n", node.name(), node.family(), node.observed(),
          node.missing() > 0 ? " (" + node.missing() + " missing, left out of the defaults)" : "",
          String.join(", ", names));
    }
  }

  private static String updateName(Update update) {
    return update.accept(
        new Update.Visitor<String>() {
          @Override
          public String conjugate(Update.Conjugate conjugate) {
            return "exact " + conjugate.kind().name().toLowerCase(Locale.ROOT);
          }

          @Override
          public String adaptiveRejection(Update.AdaptiveRejection ars) {
            return ars.smooth() ? "adaptive rejection" : "adaptive rejection, no slopes";
          }

          @Override
          public String fallback(Update.Fallback fallback) {
            return "fallback";
          }

          @Override
          public String discrete(Update.Discrete discrete) {
            return discrete.finite() ? "exact enumeration" : "integer hull";
          }

          @Override
          public String linearNormalBlock(Update.LinearNormalBlock block) {
            return "exact block normal (" + block.size() + " jointly)";
          }

          @Override
          public String groupMove(Update.GroupMove move) {
            return move.kind().word() + " move, " + lineDraw(move.logConcave());
          }

          @Override
          public String directionBlock(Update.DirectionBlock block) {
            return "direction block, " + lineDraw(block.logConcave());
          }
        });
  }

  private static String lineDraw(boolean logConcave) {
    return logConcave ? "adaptive rejection along the line" : "fallback along the line";
  }

  /** The moves along lines added after the one-at-a-time updates, with their reasons. */
  private static void printMoves(BoundModel model, PrintWriter out) {
    List<Update> moves = model.moves();
    if (moves.isEmpty()) {
      return;
    }
    out.println();
    out.println("moves added to every sweep after the updates above (off with --no-moves)");
    for (Update move : moves) {
      int[] members = move.accept(new MemberVisitor());
      List<String> labels = new ArrayList<>();
      for (int index : members) {
        labels.add(model.unknowns().get(index).label());
      }
      String who = labels.size() <= 4 ? String.join(", ", labels)
          : String.join(", ", labels.subList(0, 2)) + " .. " + labels.get(labels.size() - 1)
              + " (" + labels.size() + " unknowns)";
      out.printf("  %s: %s%n", updateName(move), who);
      out.printf("    %s%n", move.reason());
    }
  }

  /** The unknowns a move changes. */
  private static final class MemberVisitor implements Update.Visitor<int[]> {
    @Override
    public int[] conjugate(Update.Conjugate update) {
      return new int[0];
    }

    @Override
    public int[] adaptiveRejection(Update.AdaptiveRejection update) {
      return new int[0];
    }

    @Override
    public int[] fallback(Update.Fallback update) {
      return new int[0];
    }

    @Override
    public int[] discrete(Update.Discrete update) {
      return new int[0];
    }

    @Override
    public int[] linearNormalBlock(Update.LinearNormalBlock update) {
      return update.members();
    }

    @Override
    public int[] groupMove(Update.GroupMove update) {
      return update.members();
    }

    @Override
    public int[] directionBlock(Update.DirectionBlock update) {
      return update.members();
    }
  }

  /** Consecutive unknowns of one node with the same scale, kind of update and reason. */
  private static List<List<Unknown>> groups(BoundModel model) {
    List<List<Unknown>> groups = new ArrayList<>();
    List<Unknown> current = null;
    for (Unknown u : model.unknowns()) {
      if (current != null) {
        Unknown previous = current.get(current.size() - 1);
        Update a = model.update(previous.index());
        Update b = model.update(u.index());
        if (previous.node().equals(u.node())
            && previous.scale() == u.scale()
            && updateName(a).equals(updateName(b))
            && a.reason().equals(b.reason())) {
          current.add(u);
          continue;
        }
      }
      current = new ArrayList<>();
      current.add(u);
      groups.add(current);
    }
    return groups;
  }

  private static String label(List<Unknown> group) {
    if (group.size() <= 3) {
      List<String> labels = new ArrayList<>();
      for (Unknown u : group) {
        labels.add(u.label());
      }
      return String.join(", ", labels);
    }
    return group.get(0).label() + " .. " + group.get(group.size() - 1).label();
  }
}
