package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.lang.ModelException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The draws CSV reader: what it accepts, how it groups chains, and where it points at faults. */
class DrawsReaderTest {

  private static DrawsTable read(String text) {
    return DrawsReader.read("draws.csv", new StringReader(text));
  }

  private static ModelException refused(String text) {
    return assertThrows(ModelException.class, () -> read(text));
  }

  @Test
  void readsAFitFileWithInterleavedChainsGroupingRowsByChainInFileOrder() {
    DrawsTable table =
        read("chain,draw,mu,tau[1]\n1,1,0.5,2\n2,1,-0.5,3\n1,2,0.25,4\n2,2,1e-3,5\n");
    assertEquals(List.of("mu", "tau[1]"), table.variables());
    assertEquals(List.of(1L, 2L), table.chainLabels());
    assertEquals(2, table.drawsPerChain());
    assertArrayEquals(new double[][] {{0.5, 0.25}, {-0.5, 1e-3}}, table.draws("mu"));
    assertArrayEquals(new double[][] {{2, 4}, {3, 5}}, table.draws("tau[1]"));
    assertTrue(table.notes().isEmpty());
  }

  @Test
  void chainsAreOrderedByLabelWhateverOrderTheyAppearIn() {
    DrawsTable table = read("x,chain\n7,3\n1,0\n8,3\n2,0\n");
    assertEquals(List.of(0L, 3L), table.chainLabels());
    assertArrayEquals(new double[][] {{1, 2}, {7, 8}}, table.draws("x"));
  }

  @Test
  void aFileWithoutChainColumnIsOneChainAndAnIterationColumnIsNotAVariable() {
    DrawsTable table = read("Iteration,a,b\n1,1,10\n2,2,20\n3,3,30\n");
    assertEquals(List.of("a", "b"), table.variables());
    assertEquals(1, table.chainCount());
    assertArrayEquals(new double[][] {{10, 20, 30}}, table.draws("b"));
  }

  @Test
  void toleratesAByteOrderMarkCrlfLineEndsBlankLinesQuotedNamesAndSpaces() {
    DrawsTable table = read("\uFEFF\"chain\",\"beta[1,2]\"\r\n1, 1.5 \r\n\r\n1,-2\r\n");
    assertEquals(List.of("beta[1,2]"), table.variables());
    assertArrayEquals(new double[][] {{1.5, -2}}, table.draws("beta[1,2]"));
  }

  @Test
  void keepsNonFiniteWordsAsFitWritesThemAndExtremeFiniteValues() {
    DrawsTable table =
        read("x\nNaN\ninf\n-inf\nInfinity\n1e308\n-1.7976931348623157E308\n4.9e-324\n");
    assertArrayEquals(
        new double[][] {
          {
            Double.NaN, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY,
            Double.POSITIVE_INFINITY, 1e308, -Double.MAX_VALUE, Double.MIN_VALUE
          }
        },
        table.draws("x"));
  }

  @Test
  void chainsOfUnequalLengthAreCutToTheShortestWithANote() {
    DrawsTable table = read("chain,x\n1,1\n1,2\n1,3\n2,4\n2,5\n");
    assertEquals(2, table.drawsPerChain());
    assertArrayEquals(new double[][] {{1, 2}, {4, 5}}, table.draws("x"));
    assertEquals(
        List.of("the chains differ in length (chain 1: 3, chain 2: 2), so each is cut to its"
            + " first 2 draws"),
        table.notes());
  }

  @Test
  void aNonNumericCellIsNamedByFileLineCellAndColumn() {
    ModelException e = refused("chain,draw,mu,sigma\n1,1,0.1,0.2\n1,2,0.3,abc\n");
    assertEquals("draws.csv:3:4", e.position().toString());
    assertEquals("cell 4 (column 'sigma'): expected a number, got 'abc'", e.problem());
  }

  @Test
  void numbersInJavaOnlySyntaxAreNotNumbersOfACsvFile() {
    // Double.parseDouble would take all of these; a CSV number is decimal (common practice).
    for (String cell : List.of("1d", "0x1p3", "2f", "1,5", "--1", "1e", "e5", "1.2.3")) {
      ModelException e = refused("x\n\"" + cell + "\"\n");
      assertTrue(e.problem().contains("expected a number"), cell + ": " + e.problem());
    }
  }

  @Test
  void aRaggedRowIsRefusedAtItsLineWithTheCellWhereItDeviates() {
    ModelException shortRow = refused("a,b,c\n1,2,3\n4,5\n6,7,8\n");
    assertEquals("draws.csv:3:3", shortRow.position().toString());
    assertEquals("this row has 2 cells but the header has 3 columns", shortRow.problem());
    assertEquals("every row needs one cell per column", shortRow.hint());
    ModelException longRow = refused("a,b\n1,2,3\n");
    assertEquals("draws.csv:2:3", longRow.position().toString());
  }

  @Test
  void aCutShortLastRowSuggestsAnInterruptedRun() {
    ModelException e = refused("chain,draw,x,y\n1,1,0.5,0.7\n1,2,0.");
    assertEquals("draws.csv:3:4", e.position().toString());
    assertTrue(e.hint().contains("interrupted"), e.hint());
  }

  @Test
  void anEmptyFileAndAHeaderWithoutDrawsAreRefused() {
    assertEquals(
        "the draws file is empty; expected a header row naming the columns", refused("").problem());
    assertEquals("draws.csv:1:1", refused("\uFEFF\n\n").position().toString());
    ModelException headerOnly = refused("chain,draw,x\n");
    assertEquals(
        "the draws file has a header row but no draws; expected one row per draw",
        headerOnly.problem());
  }

  @Test
  void duplicateAndEmptyColumnNamesAreRefused() {
    ModelException duplicate = refused("mu,tau,mu\n1,2,3\n");
    assertEquals("draws.csv:1:3", duplicate.position().toString());
    assertEquals(
        "column names must be distinct, but 'mu' names both cell 1 and cell 3 of the header",
        duplicate.problem());
    ModelException empty = refused("mu, ,tau\n1,2,3\n");
    assertEquals("draws.csv:1:2", empty.position().toString());
    assertTrue(refused("chain,Chain,x\n1,1,1\n").problem().contains("two columns label the chain"));
    assertTrue(refused("chain,draw\n1,1\n").problem().contains("names no variable"));
  }

  @Test
  void aChainLabelMustBeAWholeNumber() {
    for (String label : List.of("one", "1.5", "", "99999999999999999999")) {
      ModelException e = refused("chain,x\n1,0\n" + label + ",1\n");
      assertEquals("draws.csv:3:1", e.position().toString(), label);
      assertTrue(
          e.problem().startsWith("cell 1 (column 'chain'): expected a whole number labelling the"
              + " chain"),
          e.problem());
    }
  }

  @Test
  void missingValuesAreRefusedBecauseDiagnosticsNeedCompleteDraws() {
    ModelException na = refused("x,y\n1,2\nNA,3\n");
    assertEquals("draws.csv:3:1", na.position().toString());
    assertTrue(na.problem().startsWith("cell 1 (column 'x') is NA; every draw must be a number"));
    ModelException empty = refused("x,y\n1,\n");
    assertEquals("draws.csv:2:2", empty.position().toString());
    assertTrue(empty.problem().startsWith("cell 2 (column 'y') is empty"));
  }

  @Test
  void aNumberBeyondTheRangeOfADoubleIsRefusedRatherThanReadAsInfinity() {
    ModelException e = refused("x\n1\n1e999\n");
    assertEquals("draws.csv:3:1", e.position().toString());
    assertTrue(e.problem().contains("'1e999' is too large to represent"), e.problem());
  }

  /**
   * Cells are read by the one number grammar (lang.NumberSyntax, as the data reader reads them;
   * issue 14): a number too small to tell from zero is refused as the data reader refuses it (it
   * was read as 0), and so is a plus sign; Java's forms are refused at file:line:cell.
   */
  @Test
  void cellsFollowTheLanguagesNumberGrammar() {
    ModelException tiny = refused("x,y\n1,2\n3,1e-999\n");
    assertEquals("draws.csv:3:2", tiny.position().toString());
    assertEquals("cell 2 (column 'y'): '1e-999' is too small to represent; it would become 0",
        tiny.problem());
    ModelException plus = refused("x\n+1.5\n");
    assertEquals("draws.csv:2:1", plus.position().toString());
    for (String cell : List.of("22d", "0x1.6p4", "2.2e1f")) {
      ModelException e = refused("chain,x\n1,0.5\n1," + cell + "\n");
      assertEquals("draws.csv:3:2", e.position().toString());
      assertEquals("cell 2 (column 'x'): expected a number, got '" + cell + "'", e.problem());
      assertTrue(e.hint().startsWith("write a number as digits"), e.hint());
    }
    ModelException label = refused("chain,x\n1d,0.5\n");
    assertEquals("draws.csv:2:1", label.position().toString());
  }

  @Test
  void lineNumbersCountQuotedLineBreaksCrAndCrlf() {
    // Lines: 1 and 2 the quoted header cell "a<LF>b", 3 "1,2" (ended by CR), 4 "3,x".
    ModelException e = refused("\"a\nb\",c\r\n1,2\r3,x\n");
    assertEquals("draws.csv:4:2", e.position().toString());
  }

  @Test
  void anUnclosedQuoteIsInvalidCsv() {
    ModelException e = refused("x,y\n1,2\n1,\"2\n3,4\n");
    assertEquals("draws.csv:3:1", e.position().toString());
    assertTrue(e.problem().startsWith("this is not valid CSV"), e.problem());
  }

  @Test
  void cellTextInMessagesIsShortAndHasControlCharactersEscaped() {
    ModelException e = refused("x\n\"a\u0007" + "b".repeat(100) + "\"\n");
    assertTrue(e.problem().contains("'a\\u0007bbb"), e.problem());
    assertTrue(e.problem().contains("...'"), e.problem());
  }

  @Test
  void aFileThatIsNotUtf8IsRefusedAsSuch(@TempDir Path folder) throws IOException {
    Path file = folder.resolve("latin1.csv");
    Files.write(file, new byte[] {'x', '\n', '1', '\n', (byte) 0xE9, '\n'});
    ModelException e = assertThrows(ModelException.class, () -> DrawsReader.read(file));
    assertEquals(file + ":3:1", e.position().toString());
    assertEquals(
        "cell 1 (column 'x') holds bytes that are not UTF-8 text (read as U+FFFD)", e.problem());
  }

  @Test
  void aMissingFileIsAnIoFailureNamingIt(@TempDir Path folder) {
    Path missing = folder.resolve("nowhere.csv");
    UncheckedIOException e =
        assertThrows(UncheckedIOException.class, () -> DrawsReader.read(missing));
    assertEquals("cannot read '" + missing + "': no such file", e.getMessage());
    UncheckedIOException directory =
        assertThrows(UncheckedIOException.class, () -> DrawsReader.read(folder));
    assertTrue(directory.getMessage().contains("it is a folder"), directory.getMessage());
  }

  @Test
  void readsALargeFileFromDisk(@TempDir Path folder) throws IOException {
    StringBuilder text = new StringBuilder("chain,draw,x\n");
    for (int i = 0; i < 50_000; i++) {
      text.append(i % 4 + 1).append(',').append(i / 4 + 1).append(',').append(i).append('\n');
    }
    Path file = folder.resolve("big.csv");
    Files.writeString(file, text);
    DrawsTable table = DrawsReader.read(file);
    assertEquals(4, table.chainCount());
    assertEquals(12_500, table.drawsPerChain());
    assertEquals(49_999, table.draws("x")[3][12_499]);
  }
}
