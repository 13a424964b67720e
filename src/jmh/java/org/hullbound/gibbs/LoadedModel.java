package org.hullbound.gibbs;

import java.io.IOException;
import org.hullbound.anchor.FusedClinicsTarget;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;

/**
 * A benchmark's model with the data table it was bound to ({@code clinics-grown}, {@link
 * GrownClinics}, or a bundled demo, {@link DemoModel}), so that the anchor can be given the
 * hand-fused {@code clinics} target on the same data.
 */
record LoadedModel(BoundModel bound, DataTable data) {

  static LoadedModel load(String name) throws IOException {
    if (name.equals("clinics-grown")) {
      DataTable data = GrownClinics.data();
      return new LoadedModel(GrownClinics.load(data), data);
    }
    DataTable data = DemoModel.data(name);
    return new LoadedModel(DemoModel.load(name, data), data);
  }

  /**
   * The fused target of this model ({@code clinics} or {@code clinics-grown} only), the patients
   * of one clinic and dose summed into one group, as hullbound's conditionals do.
   */
  FusedClinicsTarget fusedClinics() {
    return FusedClinicsTarget.of(bound, data);
  }
}
