package org.hullbound.cli;

import org.hullbound.lang.NumberSyntax;
import picocli.CommandLine;

/**
 * Reads every numeric command option with the grammar of {@link NumberSyntax}, the one a model
 * file and a data file use, instead of Java's (which takes {@code 22d}, {@code 0x1p4} and {@code
 * +2}). A whole-number option ({@code --chains}, {@code --seed}) takes any such number whose value
 * is whole and fits, so {@code 1e3} is 1000 and {@code 2.5} is refused with the value named.
 */
final class NumberOptions {
  private NumberOptions() {}

  /** Registers the converters on {@code commandLine} and its subcommands; returns it. */
  static CommandLine register(CommandLine commandLine) {
    CommandLine.ITypeConverter<Double> real = NumberOptions::real;
    CommandLine.ITypeConverter<Integer> integer =
        text -> (int) whole(text, Integer.MIN_VALUE, Integer.MAX_VALUE, 0x1p31);
    CommandLine.ITypeConverter<Long> longInteger =
        text -> whole(text, Long.MIN_VALUE, Long.MAX_VALUE, 0x1p63);
    return commandLine
        .registerConverter(Double.class, real)
        .registerConverter(Double.TYPE, real)
        .registerConverter(Integer.class, integer)
        .registerConverter(Integer.TYPE, integer)
        .registerConverter(Long.class, longInteger)
        .registerConverter(Long.TYPE, longInteger);
  }

  private static double real(String text) {
    try {
      return NumberSyntax.parse(text.strip());
    } catch (NumberSyntax.InvalidNumberException e) {
      throw new CommandLine.TypeConversionException(e.getMessage() + "; " + e.hint());
    }
  }

  /**
   * A whole number in [lowest, highest]; {@code limit} = highest + 1 = -lowest, exact as a double.
   */
  private static long whole(String text, long lowest, long highest, double limit) {
    double value = real(text);
    if (value != Math.rint(value) || Double.isInfinite(value)) {
      throw new CommandLine.TypeConversionException(
          "'" + text + "' is not a whole number");
    }
    if (value < -limit || value >= limit) {
      throw new CommandLine.TypeConversionException(
          "'" + text + "' is out of range; it must lie between " + lowest + " and " + highest);
    }
    return (long) value;
  }
}
