package org.hullbound.validation;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.hullbound.lang.Expression;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.SourcePosition;
import org.hullbound.lang.Statement;
import org.hullbound.model.DataTable;
import org.hullbound.model.PriorSimulation.SimulatedValue;
import org.hullbound.model.SimulationException;

/**
 * Writes simulated observations back where the observed ones were, in the data tables (by file,
 * line and column of the cell) and in the model's inline data (by position), so that the model can
 * be bound again to data simulated from itself.
 *
 * <p>Why at the level of the tables: binding folds data into constants, so the honest way to a model of
 * the simulated data is to bind it afresh, exactly as a user's data would be.
 */
final class SimulatedData {
  private SimulatedData() {}

  /** A model file and its data tables, as handed to {@code BoundModel.bind}. */
  record Inputs(ModelFile model, List<DataTable> tables) {}

  /**
   * The model and tables with every simulated value written over the observed one.
   *
   * @throws SimulationException when a simulated value's origin is neither a cell of a table nor
   *     an inline value of the model
   */
  static Inputs replace(ModelFile model, List<DataTable> tables, List<SimulatedValue> values) {
    Map<SourcePosition, SimulatedValue> byOrigin = new HashMap<>();
    for (SimulatedValue v : values) {
      byOrigin.put(v.origin(), v);
    }
    Set<SourcePosition> used = new HashSet<>();
    List<DataTable> newTables = new ArrayList<>();
    for (DataTable table : tables) {
      List<Integer> rows = new ArrayList<>();
      List<Integer> columns = new ArrayList<>();
      List<Double> numbers = new ArrayList<>();
      for (int r = 0; r < table.rowCount(); r++) {
        for (int j = 0; j < table.header().size(); j++) {
          SourcePosition at = new SourcePosition(table.fileName(), table.line(r), j + 1);
          SimulatedValue v = byOrigin.get(at);
          if (v != null) {
            if (!Double.isFinite(v.value()) || !table.holds(j)) {
              throw new SimulationException(
                  "cannot write the simulated value " + v.value() + " of '" + v.label()
                      + "' back to " + at);
            }
            rows.add(r);
            columns.add(j);
            numbers.add(v.value());
            used.add(at);
          }
        }
      }
      newTables.add(
          table.withNumbers(
              rows.stream().mapToInt(Integer::intValue).toArray(),
              columns.stream().mapToInt(Integer::intValue).toArray(),
              numbers.stream().mapToDouble(Double::doubleValue).toArray()));
    }
    List<Statement> statements = new ArrayList<>();
    for (Statement statement : model.statements()) {
      if (statement instanceof Statement.Data data && data.inlineValues() != null) {
        List<Statement.InlineValue> inline = new ArrayList<>();
        for (Statement.InlineValue value : data.inlineValues()) {
          SimulatedValue v = byOrigin.get(value.position());
          if (v != null && !value.missing()) {
            inline.add(new Statement.InlineValue(v.value(), false, value.position()));
            used.add(value.position());
          } else {
            inline.add(value);
          }
        }
        statements.add(new Statement.Data(data.targets(), inline, data.likelihood(), data.position()));
      } else {
        statements.add(statement);
      }
    }
    for (SimulatedValue v : values) {
      if (!used.contains(v.origin())) {
        throw new SimulationException(
            "cannot write the simulated value of '" + v.label() + "' back: its origin " + v.origin()
                + " is neither a data-file cell nor an inline value");
      }
    }
    return new Inputs(new ModelFile(model.source(), statements), newTables);
  }

  /**
   * The modelled data names (a {@code ~} on a data line) that other statements read: simulating
   * those is refused, since binding folds their observed values into the statements that read them.
   */
  static List<String> modelledDataReadElsewhere(ModelFile model) {
    Set<String> modelled = new HashSet<>();
    for (Statement s : model.statements()) {
      if (s instanceof Statement.Data data && data.likelihood() != null) {
        data.targets().forEach(t -> modelled.add(t.name().text()));
      }
    }
    List<String> readElsewhere = new ArrayList<>();
    for (Statement s : model.statements()) {
      Set<String> read = new HashSet<>();
      if (s instanceof Statement.Param param) {
        collect(param.prior(), read);
      } else if (s instanceof Statement.Data data && data.likelihood() != null) {
        collect(data.likelihood(), read);
      } else if (s instanceof Statement.Let let) {
        collect(let.value(), read);
      } else if (s instanceof Statement.Index index && !index.sizedFromData()) {
        collect(index.lower(), read);
        collect(index.upper(), read);
      }
      for (String name : read) {
        if (modelled.contains(name) && !readElsewhere.contains(name)) {
          readElsewhere.add(name);
        }
      }
    }
    return readElsewhere;
  }

  private static void collect(org.hullbound.lang.Distribution d, Set<String> into) {
    d.arguments().forEach(a -> collect(a.value(), into));
    if (d.truncation() != null) {
      collect(d.truncation().lower(), into);
      collect(d.truncation().upper(), into);
    }
  }

  private static void collect(Expression e, Set<String> into) {
    if (e instanceof Expression.Name name) {
      into.add(name.name().text());
      name.indexes().forEach(i -> collect(i, into));
    } else if (e instanceof Expression.Negation negation) {
      collect(negation.operand(), into);
    } else if (e instanceof Expression.Binary binary) {
      collect(binary.left(), into);
      collect(binary.right(), into);
    } else if (e instanceof Expression.Call call) {
      call.arguments().forEach(a -> collect(a, into));
    } else if (e instanceof Expression.Sum sum) {
      collect(sum.body(), into);
    }
  }
}
