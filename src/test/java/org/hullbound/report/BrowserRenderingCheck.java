package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.ByteArrayOutputStream;
import java.io.File;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A real browser opens a generated report: headless Chromium's DOM after parsing must hold every
 * SVG panel and every table row, and a screenshot must come out at the asked size.
 *
 * <p>Chromium is required, not optional: without it this test fails and says how to install it, so
 * a machine that cannot run it never reports the check as passed.
 */
class BrowserRenderingCheck {
  private static final long TIMEOUT_SECONDS = 120;

  private static String report;

  @BeforeAll
  static void render() {
    report = HtmlReport.render(SampleReports.showcase());
  }

  private static Path chromium() {
    Optional<Path> found = Optional.empty();
    String path = System.getenv("PATH");
    if (path != null) {
      for (String folder : path.split(File.pathSeparator)) {
        Path candidate = Path.of(folder, "chromium");
        if (Files.isExecutable(candidate)) {
          found = Optional.of(candidate);
          break;
        }
      }
    }
    if (found.isEmpty() && Files.isExecutable(Path.of("/usr/bin/chromium"))) {
      found = Optional.of(Path.of("/usr/bin/chromium"));
    }
    return found.orElseGet(
        () ->
            fail(
                "BrowserRenderingCheck needs a 'chromium' binary on the PATH (e.g."
                    + " /usr/bin/chromium) to render the HTML report in a real browser. Install it"
                    + " with 'apt-get update && apt-get install -y chromium' (Debian/Ubuntu) and"
                    + " run again."));
  }

  /** Runs headless Chromium on {@code page} with the extra arguments; returns its stdout. */
  private static String runChromium(Path work, Path page, String... extra) throws Exception {
    List<String> command = new ArrayList<>();
    command.add(chromium().toString());
    command.addAll(
        List.of(
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-quic",
            "--no-first-run",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
            "--user-data-dir=" + Files.createTempDirectory(work, "profile-")));
    command.addAll(List.of(extra));
    command.add(page.toUri().toString());
    ProcessBuilder builder = new ProcessBuilder(command);
    builder.redirectError(work.resolve("chromium-" + System.nanoTime() + ".log").toFile());
    Process process = builder.start();
    ByteArrayOutputStream out = new ByteArrayOutputStream();
    Thread pump =
        new Thread(
            () -> {
              try (InputStream in = process.getInputStream()) {
                in.transferTo(out);
              } catch (IOException e) {
                throw new UncheckedIOException(e);
              }
            });
    pump.start();
    if (!process.waitFor(TIMEOUT_SECONDS, TimeUnit.SECONDS)) {
      process.descendants().forEach(ProcessHandle::destroyForcibly);
      process.destroyForcibly();
      fail("chromium did not finish within " + TIMEOUT_SECONDS + " s: " + command);
    }
    pump.join(10_000);
    assertEquals(0, process.exitValue(), "chromium exit status for " + command);
    return out.toString(StandardCharsets.UTF_8);
  }

  @Test
  void theRenderedDomHoldsEveryPlotAndEveryTableRow(@TempDir Path work) throws Exception {
    Path page = work.resolve("report.html");
    ReportWriter.writeAtomically(page, report);
    String dom = runChromium(work, page, "--dump-dom");
    // Showcase: 6 unknowns with 4 panels each, every panel an inline <svg>, and 3 pair scatters.
    assertEquals(24 + 3, Xml.count(dom, "<svg"), "svg elements in the browser's DOM");
    assertEquals(6, Xml.count(dom, "class=\"plot plot-trace\""), "trace plots");
    assertEquals(6, Xml.count(dom, "<td class=\"name\">"), "table rows");
    assertEquals(6, Xml.count(dom, "<section class=\"unknown\""), "unknown sections");
    assertTrue(dom.contains("tau &lt;&amp;&gt; \"odd\""), "escaped name survives parsing");
    assertTrue(dom.contains("R-hat is 1.41"), "warnings are rendered");
  }

  @Test
  void aScreenshotComesOutAtTheWindowSize(@TempDir Path work) throws Exception {
    Path page = work.resolve("report.html");
    ReportWriter.writeAtomically(page, report);
    Path shot = work.resolve("report.png");
    runChromium(work, page, "--screenshot=" + shot, "--window-size=1200,2000", "--hide-scrollbars");
    assertTrue(Files.isRegularFile(shot), "no screenshot written");
    byte[] png = Files.readAllBytes(shot);
    // PNG signature and IHDR width/height (PNG specification, W3C 2003, sections 5.2 and 11.2.2).
    byte[] signature = {(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1a, '\n'};
    for (int i = 0; i < signature.length; i++) {
      assertEquals(signature[i], png[i], "PNG signature byte " + i);
    }
    ByteBuffer header = ByteBuffer.wrap(png, 16, 8);
    assertEquals(1200, header.getInt(), "width");
    assertEquals(2000, header.getInt(), "height");
    assertTrue(png.length > 50_000, "a blank page would compress to far less: " + png.length);
  }
}
