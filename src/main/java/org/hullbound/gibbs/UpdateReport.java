package org.hullbound.gibbs;

import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;

/**
 * How each unknown was updated over all chains of a run: the method (with {@code + shift move}
 * and the like for the extra moves that also moved it), density evaluations per draw (the moves'
 * shared among the unknowns they move), and any switch to the fallback at run time.
 *
 * @param index the unknown's state entry
 * @param method the method used (chains that switched name both methods)
 * @param evaluationsPerDraw density evaluations per conditional draw, over all chains (0 for
 *     exact conjugate and block draws)
 * @param switches one note per chain that switched, else empty
 * @param firstSwitchSweep the earliest sweep at which a chain switched, 0 when none did
 */
public record UpdateReport(
    int index, String method, double evaluationsPerDraw, List<String> switches, long firstSwitchSweep) {

  public UpdateReport {
    switches = List.copyOf(switches);
  }

  /** The reports of every state entry of a finished run, in state order. */
  public static List<UpdateReport> of(int dimension, List<? extends ChainKernel> kernels) {
    List<Set<String>> methods = new ArrayList<>();
    List<Set<String>> moves = new ArrayList<>();
    long[] evaluations = new long[dimension];
    long[] draws = new long[dimension];
    List<List<String>> notes = new ArrayList<>();
    long[] firstSwitch = new long[dimension];
    for (int i = 0; i < dimension; i++) {
      methods.add(new LinkedHashSet<>());
      moves.add(new LinkedHashSet<>());
      notes.add(new ArrayList<>());
    }
    for (int chain = 0; chain < kernels.size(); chain++) {
      if (!(kernels.get(chain) instanceof GibbsKernel kernel)) {
        throw new IllegalArgumentException("kernels must be Gibbs kernels, got " + kernels.get(chain));
      }
      for (Updater updater : kernel.updaters()) {
        int[] indices = updater.indices();
        for (int index : indices) {
          if (updater.extra()) {
            // a move's cost is shared by the unknowns it moves; its line draws are not their draws
            moves.get(index).add(updater.method());
            if (updater instanceof LineMoveUpdater block) {
              // after burn-in a direction block may draw its members in place of their own draws
              draws[index] += block.memberDraws();
            }
          } else {
            methods.get(index).add(updater.method());
            draws[index] += updater.draws() / indices.length;
          }
          evaluations[index] += updater.evaluations() / indices.length;
          if (updater.switchNote() != null) {
            notes.get(index).add("chain " + (chain + 1) + " " + updater.switchNote());
            long sweep = updater.switchSweep();
            firstSwitch[index] = firstSwitch[index] == 0 ? sweep : Math.min(firstSwitch[index], sweep);
          }
        }
      }
    }
    List<UpdateReport> reports = new ArrayList<>();
    for (int i = 0; i < dimension; i++) {
      double perDraw = draws[i] == 0 ? 0.0 : (double) evaluations[i] / draws[i];
      reports.add(
          new UpdateReport(
              i, String.join(" / ", methods.get(i))
                  + (moves.get(i).isEmpty() ? "" : " + " + String.join(" + ", moves.get(i))),
              perDraw, notes.get(i), firstSwitch[i]));
    }
    return reports;
  }
}
