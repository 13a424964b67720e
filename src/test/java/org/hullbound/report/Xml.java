package org.hullbound.report;

import java.io.IOException;
import java.io.StringReader;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.xml.XMLConstants;
import javax.xml.parsers.DocumentBuilder;
import javax.xml.parsers.DocumentBuilderFactory;
import javax.xml.parsers.ParserConfigurationException;
import org.w3c.dom.Document;
import org.xml.sax.InputSource;
import org.xml.sax.SAXException;
import org.xml.sax.helpers.DefaultHandler;

/** Parses markup with the JDK's own XML parser, the outside judge of well-formedness in tests. */
final class Xml {
  private Xml() {}

  private static final Pattern SVG = Pattern.compile("<svg\\b.*?</svg>", Pattern.DOTALL);

  /**
   * Parses {@code text} as a namespace-aware XML document; fails the test with the parser's words.
   */
  static Document parse(String text) {
    try {
      DocumentBuilderFactory factory = DocumentBuilderFactory.newInstance();
      factory.setNamespaceAware(true);
      factory.setFeature(XMLConstants.FEATURE_SECURE_PROCESSING, true);
      factory.setFeature("http://apache.org/xml/features/disallow-doctype-decl", false);
      factory.setFeature("http://apache.org/xml/features/nonvalidating/load-external-dtd", false);
      DocumentBuilder builder = factory.newDocumentBuilder();
      builder.setErrorHandler(new DefaultHandler()); // no printing; fatal errors still throw
      return builder.parse(new InputSource(new StringReader(text)));
    } catch (SAXException | IOException | ParserConfigurationException e) {
      throw new AssertionError("not well-formed XML: " + e.getMessage(), e);
    }
  }

  /** Every inline {@code <svg>...</svg>} element of a page, in order. */
  static List<String> inlineSvgs(String html) {
    List<String> found = new ArrayList<>();
    Matcher m = SVG.matcher(html);
    while (m.find()) {
      found.add(m.group());
    }
    return found;
  }

  /** How often {@code needle} occurs in {@code text}. */
  static int count(String text, String needle) {
    int count = 0;
    for (int i = text.indexOf(needle); i >= 0; i = text.indexOf(needle, i + needle.length())) {
      count++;
    }
    return count;
  }
}
