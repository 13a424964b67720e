package org.hullbound.io;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.zip.CRC32;
import org.hullbound.gibbs.ChainRandom;
import org.hullbound.gibbs.ChainState;
import org.hullbound.gibbs.KernelState;
import org.hullbound.gibbs.UpdaterState;
import org.hullbound.lang.NumberSyntax;

/**
 * Reads and writes {@code DIR/checkpoint.txt}: a {@link Checkpoint} as labelled lines of text,
 * numbers in hexadecimal (doubles by their raw bits, so that nothing is lost), ended by a CRC-32
 * of everything before it.
 *
 * <p>Text so that a person can see what was saved; the check line so that a damaged or hand-edited
 * file is refused instead of silently giving other draws. Written to a temporary file and renamed
 * ({@link AtomicFiles}), so that an interrupt while writing leaves the older checkpoint or none.
 */
public final class CheckpointFile {
  /** The file name inside the output folder. */
  public static final String FILE_NAME = "checkpoint.txt";

  /**
   * The layout this build writes and reads, raised whenever what an updater's {@code save()}
   * writes, or the draws that follow a restored state, change. Format 1 was written in two layouts:
   * up to 11200c3, and by the builds of 3 December 2026 (session 6), whose direction blocks also
   * save their conditional Hessian and whose cheap adaptive rejection path uses random numbers
   * otherwise. The file cannot tell them apart, and neither can be continued by this build to the
   * draws its writer would have made, so both are refused by their format.
   */
  static final int FORMAT = 2;

  private static final String FORMAT_PREFIX = "hullbound checkpoint, format ";
  private static final String FIRST_LINE = FORMAT_PREFIX + FORMAT;
  private static final HexFormat HEX = HexFormat.of();

  private CheckpointFile() {}

  /** Where the checkpoint of the run in {@code directory} lives. */
  public static Path in(Path directory) {
    return directory.resolve(FILE_NAME);
  }

  /**
   * The SHA-256 (FIPS 180-4) of the model text and each data text, each preceded by its length so
   * that moving text from one file to the next changes the hash.
   */
  public static String inputHash(String modelText, List<String> dataTexts) {
    try {
      MessageDigest digest = MessageDigest.getInstance("SHA-256");
      List<String> all = new ArrayList<>();
      all.add(modelText);
      all.addAll(dataTexts);
      for (String text : all) {
        byte[] bytes = text.getBytes(StandardCharsets.UTF_8);
        digest.update((bytes.length + ":").getBytes(StandardCharsets.UTF_8));
        digest.update(bytes);
      }
      return HEX.formatHex(digest.digest());
    } catch (NoSuchAlgorithmException missing) {
      throw new IllegalStateException("SHA-256 is required of every Java platform", missing);
    }
  }

  /** Writes {@code checkpoint} to {@code DIR/checkpoint.txt} atomically. */
  public static void write(Path directory, Checkpoint checkpoint) {
    StringBuilder text = new StringBuilder();
    text.append(FIRST_LINE).append('\n');
    text.append("status: ").append(checkpoint.complete() ? "complete" : "interrupted").append('\n');
    text.append("model: ").append(escape(checkpoint.modelFile())).append('\n');
    text.append("model and data sha-256: ").append(checkpoint.inputHash()).append('\n');
    text.append("seed: ").append(checkpoint.seed()).append('\n');
    text.append("chains: ").append(checkpoint.chains().size()).append('\n');
    text.append("burn-in: ").append(checkpoint.burnIn()).append('\n');
    text.append("draws: ").append(checkpoint.draws()).append('\n');
    text.append("thin: ").append(checkpoint.thin()).append('\n');
    text.append("unknowns: ").append(checkpoint.columns().size()).append('\n');
    for (String column : checkpoint.columns()) {
      text.append("unknown: ").append(escape(column)).append('\n');
    }
    int number = 0;
    for (ChainState chain : checkpoint.chains()) {
      number++;
      KernelState kernel = chain.kernel();
      text.append("chain ").append(number).append(": sweep ").append(chain.sweep())
          .append(", draws ").append(chain.draws()).append('\n');
      text.append("generator:").append(words(chain.generator())).append('\n');
      double[] values = kernel.values();
      long[] bits = new long[values.length];
      for (int k = 0; k < values.length; k++) {
        bits[k] = Double.doubleToRawLongBits(values[k]);
      }
      text.append("values:").append(words(bits)).append('\n');
      text.append("updaters: ").append(kernel.updaters().size()).append('\n');
      for (UpdaterState updater : kernel.updaters()) {
        text.append("updater:").append(words(updater.words())).append('\n');
        text.append("note: ")
            .append(updater.note() == null ? "-" : "'" + escape(updater.note()))
            .append('\n');
      }
    }
    CRC32 crc = new CRC32();
    crc.update(text.toString().getBytes(StandardCharsets.UTF_8));
    text.append("check: ").append(String.format("%08x", crc.getValue())).append('\n');
    AtomicFiles.write(in(directory), text.toString());
  }

  /**
   * Reads the checkpoint in {@code directory}.
   *
   * @throws CheckpointException when there is none, or it is damaged (the message says where)
   */
  public static Checkpoint read(Path directory) {
    Path file = in(directory);
    String text;
    try {
      text = Files.readString(file, StandardCharsets.UTF_8);
    } catch (NoSuchFileException missing) {
      throw new CheckpointException(
          "no checkpoint in " + directory + " (" + file + " does not exist): only an interrupted"
              + " fit leaves one");
    } catch (IOException e) {
      throw new CheckpointException("cannot read " + file + ": " + e.getMessage());
    }
    return parse(file.toString(), text);
  }

  /** Parses a checkpoint's text; {@code name} is used in messages. */
  static Checkpoint parse(String name, String text) {
    refuseOtherFormat(name, text);
    int checkAt = text.lastIndexOf("check: ");
    if (!text.startsWith(FIRST_LINE + "\n") || checkAt < 0 || !text.endsWith("\n")) {
      throw damaged(name, "it does not start with '" + FIRST_LINE + "' or end with a check line");
    }
    CRC32 crc = new CRC32();
    crc.update(text.substring(0, checkAt).getBytes(StandardCharsets.UTF_8));
    String expected = String.format("%08x", crc.getValue());
    String found = text.substring(checkAt + "check: ".length(), text.length() - 1);
    if (!expected.equals(found)) {
      throw damaged(name, "its check value is " + found + " but its content gives " + expected);
    }
    Lines lines = new Lines(name, text.substring(0, checkAt).split("\n", -1));
    try {
      lines.next();
      String status = lines.value("status");
      if (!status.equals("complete") && !status.equals("interrupted")) {
        throw damaged(name, "line 2: status must be 'complete' or 'interrupted', got " + status);
      }
      String model = unescape(lines.value("model"));
      String hash = lines.value("model and data sha-256");
      long seed = lines.whole("seed", Long.MIN_VALUE);
      int chains = lines.count("chains");
      int burnIn = lines.count("burn-in");
      int draws = lines.count("draws");
      int thin = lines.count("thin");
      int unknowns = lines.count("unknowns");
      List<String> columns = new ArrayList<>();
      for (int k = 0; k < unknowns; k++) {
        columns.add(unescape(lines.value("unknown")));
      }
      List<ChainState> states = new ArrayList<>();
      for (int chain = 1; chain <= chains; chain++) {
        String head = lines.value("chain " + chain);
        String[] parts = head.split(", ");
        if (parts.length != 2 || !parts[0].startsWith("sweep ") || !parts[1].startsWith("draws ")) {
          throw damaged(
              name, "line " + lines.number + ": expected 'sweep N, draws N', got " + head);
        }
        int sweepAt = ("chain " + chain + ": sweep ").length() + 1;
        long sweep = lines.whole(parts[0].substring("sweep ".length()), sweepAt, 0);
        int kept = (int) lines.whole(parts[1].substring("draws ".length()),
            sweepAt + parts[0].length() - "sweep ".length() + ", draws ".length(), 0);
        long[] generator = parseWords(lines.value("generator"));
        long[] bits = parseWords(lines.value("values"));
        double[] values = new double[bits.length];
        for (int k = 0; k < bits.length; k++) {
          values[k] = Double.longBitsToDouble(bits[k]);
        }
        int updaterCount = lines.count("updaters");
        List<UpdaterState> updaters = new ArrayList<>();
        for (int k = 0; k < updaterCount; k++) {
          long[] words = parseWords(lines.value("updater"));
          String note = lines.value("note");
          updaters.add(
              new UpdaterState(words, note.equals("-") ? null : unescape(note.substring(1))));
        }
        if (generator.length != ChainRandom.STATE_LENGTH) {
          throw damaged(name, "chain " + chain + ": the generator needs "
              + ChainRandom.STATE_LENGTH + " numbers, got " + generator.length);
        }
        states.add(new ChainState(sweep, kept, generator, new KernelState(values, updaters)));
      }
      if (lines.hasMore()) {
        throw damaged(name, "line " + (lines.number + 1) + " is not expected after the last chain");
      }
      return new Checkpoint(
          status.equals("complete"), model, hash, seed, burnIn, draws, thin, columns, states);
    } catch (IllegalArgumentException bad) {
      // NumberFormatException included: say where.
      throw damaged(name, "line " + lines.number + ": " + bad.getMessage());
    }
  }

  /**
   * Refuses a checkpoint of another format by name before anything else is read: its words would
   * be read by the wrong layout (a direction block's saved flag then reads some count), and even
   * when they fit, this build's samplers would not make the draws the writing build would have.
   */
  private static void refuseOtherFormat(String name, String text) {
    if (!text.startsWith(FORMAT_PREFIX)) {
      return; // not a checkpoint at all: the damaged-file message below says so
    }
    int end = text.indexOf('\n');
    String written = text.substring(FORMAT_PREFIX.length(), end < 0 ? text.length() : end);
    if (written.length() > 20) {
      written = written.substring(0, 20) + "...";
    }
    if (!written.equals(String.valueOf(FORMAT))) {
      throw new CheckpointException(
          "the checkpoint " + name + " is in format " + written + ", written by another version of"
              + " hullbound; this version reads format " + FORMAT + " only (the samplers' saved"
              + " state differs between them, so that run cannot be continued to the draws it"
              + " would have made): start a new fit, or resume with the version that wrote it");
    }
  }

  private static CheckpointException damaged(String name, String why) {
    return new CheckpointException("the checkpoint " + name + " is damaged: " + why);
  }

  private static String words(long[] words) {
    StringBuilder out = new StringBuilder();
    for (long word : words) {
      out.append(' ').append(HEX.toHexDigits(word));
    }
    return out.toString();
  }

  private static long[] parseWords(String text) {
    String trimmed = text.trim();
    if (trimmed.isEmpty()) {
      return new long[0];
    }
    String[] parts = trimmed.split(" ");
    long[] words = new long[parts.length];
    for (int k = 0; k < parts.length; k++) {
      if (parts[k].length() != 16) {
        throw new IllegalArgumentException(
            "expected 16 hexadecimal digits, got '" + parts[k] + "'");
      }
      words[k] = HexFormat.fromHexDigitsToLong(parts[k]);
    }
    return words;
  }

  private static String escape(String text) {
    return text.replace("\\", "\\\\").replace("\n", "\\n").replace("\r", "\\r");
  }

  private static String unescape(String text) {
    StringBuilder out = new StringBuilder(text.length());
    for (int k = 0; k < text.length(); k++) {
      char c = text.charAt(k);
      if (c == '\\' && k + 1 < text.length()) {
        char next = text.charAt(++k);
        out.append(next == 'n' ? '\n' : next == 'r' ? '\r' : next);
      } else {
        out.append(c);
      }
    }
    return out.toString();
  }

  /** The lines of a checkpoint, each expected to start with a given label. */
  private static final class Lines {
    private final String name;
    private final String[] lines;
    private int number;

    Lines(String name, String[] lines) {
      this.name = name;
      // The text before the check line ends with a newline: drop the empty last piece.
      this.lines =
          lines.length > 0 && lines[lines.length - 1].isEmpty()
              ? java.util.Arrays.copyOf(lines, lines.length - 1)
              : lines;
    }

    String next() {
      if (number >= lines.length) {
        throw damaged(name, "it ends early, after line " + number);
      }
      return lines[number++];
    }

    /** The text after {@code label:} (with or without a space) on the next line. */
    String value(String label) {
      String line = next();
      if (!line.startsWith(label + ":")) {
        throw damaged(name, "line " + number + ": expected '" + label + ":', got '" + line + "'");
      }
      String rest = line.substring(label.length() + 1);
      return rest.startsWith(" ") && !label.equals("generator") && !label.equals("values")
              && !label.equals("updater")
          ? rest.substring(1)
          : rest;
    }

    /**
     * The whole number after {@code label:} on the next line, at least {@code least}, read by the
     * one number grammar ({@link NumberSyntax}: {@code 22d} or {@code 0x16} is not 22).
     */
    long whole(String label, long least) {
      String text = value(label);
      return whole(text, label.length() + 3, least);
    }

    /** A count (a whole number from 0 to the largest int) after {@code label:} on the next line. */
    int count(String label) {
      String text = value(label);
      long value = whole(text, label.length() + 3, 0);
      if (value > Integer.MAX_VALUE) {
        throw at(label.length() + 3, "'" + text + "' is too large for a count");
      }
      return (int) value;
    }

    /** {@code text}, found at {@code column} of the current line, as a whole number >= least. */
    long whole(String text, int column, long least) {
      long value;
      try {
        value = NumberSyntax.parseWhole(text);
      } catch (NumberSyntax.InvalidNumberException notWhole) {
        throw at(column, notWhole.getMessage() + "; expected a whole number");
      }
      if (value < least) {
        throw at(column, "'" + text + "' is below " + least);
      }
      return value;
    }

    /** The checkpoint is damaged at {@code column} of the current line: file:line:column first. */
    CheckpointException at(int column, String why) {
      return new CheckpointException(
          name + ":" + number + ":" + column + ": the checkpoint is damaged: " + why);
    }

    boolean hasMore() {
      return number < lines.length;
    }
  }
}
