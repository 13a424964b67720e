package org.hullbound.cli;

import picocli.CommandLine;

/** Reports the version from the jar manifest, so that it is set in one place: the pom. */
final class VersionProvider implements CommandLine.IVersionProvider {
  @Override
  public String[] getVersion() {
    String version = Main.class.getPackage().getImplementationVersion();
    return new String[] {"hullbound " + (version == null ? "(development build)" : version)};
  }
}
