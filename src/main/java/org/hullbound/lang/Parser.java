package org.hullbound.lang;

import java.util.ArrayList;
import java.util.List;

/**
 * Reads a model file into its syntax tree ({@link ModelFile}) by recursive descent.
 *
 * <p>Hand-written so that every syntax error is a {@link ModelException} at the offending token,
 * saying what was found and what was expected. The parser checks the shape of statements and that
 * called functions exist with the right number of arguments ({@link Functions}); family and
 * argument names, index sets and the graph are checked by the {@code model} package. Nesting is
 * bounded, so deeply nested input gives a clear error rather than exhausting the stack of this or
 * any later stage that walks the tree.
 *
 * <pre>
 * file       = { statement? NEWLINE }
 * statement  = "model" name
 *            | "index" name [ "=" expr ".." expr ]
 *            | "data" declarator { "," declarator }
 *            | "data" declarator [ "=" inline ] [ "~" distribution [ censoring ] ]
 *            | "param" declarator "~" distribution
 *            | [ "keep" | "hide" ] "let" declarator "=" expr
 *            | "check" name "=" expr
 * declarator = name [ "[" name { "," name } "]" ]
 * inline     = [ "-" ] number | "[" value { "," value } "]"      value = [ "-" ] number | "NA"
 * distribution = name "(" [ name "=" expr { "," name "=" expr } ] ")" [ "within" expr ".." expr ]
 * censoring  = "censored" expr ".." expr [ "when" expr ]   (both words only in this place)
 * expr       = term { ("+" | "-") term }
 * term       = unary { ("*" | "/") unary }
 * unary      = "-" unary | power
 * power      = primary [ "^" unary ]                 (so -x^2 is -(x^2) and 2^3^2 is 2^(3^2))
 * primary    = number | "inf" | name [ "[" expr { "," expr } "]" ] | "(" expr ")"
 *            | function "(" expr { "," expr } ")" | "sum" "(" name ":" expr ")"
 * </pre>
 */
public final class Parser {

  /** The deepest nesting of parentheses, brackets, calls, minus signs and powers accepted. */
  public static final int MAX_NESTING = 200;

  /** The greatest height of an expression tree accepted (long chains such as a + b + c ...). */
  public static final int MAX_HEIGHT = 500;

  /** The word that starts a censoring clause, a keyword only after a data line's distribution. */
  static final String CENSORED = "censored";

  /** The word before the 0/1 expression that picks the censored rows. */
  static final String WHEN = "when";

  private static final List<String> STATEMENT_KEYWORDS =
      List.of("model", "index", "data", "param", "let", "check");

  /** The words that may stand before {@code let}; names everywhere else. */
  private static final java.util.Map<String, Statement.Keeping> MARKS =
      java.util.Map.of("keep", Statement.Keeping.KEEP, "hide", Statement.Keeping.HIDE);

  private final SourceText source;
  private final Lexer lexer;
  private final Token[] lookahead = new Token[2];
  private int buffered;
  private Token previous;
  private int nesting;
  /** Whether the value of a {@code check} is being read: only there may indicators and largest or smallest reductions stand. */
  private boolean inCheck;
  private Statement.ModelName modelName;

  private Parser(SourceText source) {
    this.source = source;
    this.lexer = Lexer.of(source);
  }

  /**
   * Parses a whole model file.
   *
   * @throws ModelException at the first syntax error
   */
  public static ModelFile parse(SourceText source) {
    if (source == null) {
      throw new IllegalArgumentException("source must not be null");
    }
    return new Parser(source).file();
  }

  /**
   * Parses {@code text}, read from the file called {@code fileName} (used in messages only).
   *
   * @throws ModelException at the first syntax error
   */
  public static ModelFile parse(String fileName, String text) {
    if (fileName == null) {
      throw new IllegalArgumentException("fileName must not be null");
    }
    if (text == null) {
      throw new IllegalArgumentException("text must not be null");
    }
    return parse(SourceText.of(fileName, text));
  }

  /**
   * Parses {@code text} as one expression (the right-hand side of a {@code let}), for tools and
   * tests that work on expressions alone.
   *
   * @throws ModelException at the first syntax error, or when anything follows the expression
   */
  public static Expression parseExpression(String fileName, String text) {
    if (fileName == null) {
      throw new IllegalArgumentException("fileName must not be null");
    }
    if (text == null) {
      throw new IllegalArgumentException("text must not be null");
    }
    Parser parser = new Parser(SourceText.of(fileName, text));
    while (parser.accept(Token.Kind.NEWLINE)) {
      // leading blank lines
    }
    Expression expression = parser.expression();
    while (parser.accept(Token.Kind.NEWLINE)) {
      // trailing blank lines
    }
    if (!parser.at(Token.Kind.END)) {
      throw parser.expected("an operator or the end of the expression", parser.peek(), null);
    }
    return expression;
  }

  /** An expression computed from intermediate results, with the height of its tree. */
  private record Parsed(Expression expression, int height) {}

  // ---------------------------------------------------------------- statements

  private ModelFile file() {
    List<Statement> statements = new ArrayList<>();
    while (true) {
      while (accept(Token.Kind.NEWLINE)) {
        // blank and comment-only lines
      }
      if (at(Token.Kind.END)) {
        return new ModelFile(source, statements);
      }
      statements.add(statement());
    }
  }

  private Statement statement() {
    Token keyword = peek();
    return switch (keyword.kind()) {
      case MODEL -> modelStatement();
      case INDEX -> indexStatement();
      case DATA -> dataStatement();
      case PARAM -> paramStatement();
      case LET -> letStatement(Statement.Keeping.DEFAULT, null);
      case CHECK -> checkStatement();
      case NAME -> markedLet(keyword);
      default -> throw notAStatement(keyword);
    };
  }

  /**
   * {@code keep let ...} or {@code hide let ...}. The two words are marks only right before
   * {@code let}, not reserved: a model may still name a quantity {@code keep}.
   */
  private Statement markedLet(Token word) {
    Statement.Keeping keeping = MARKS.get(word.text());
    if (keeping == null) {
      throw notAStatement(word);
    }
    Token next = peek(1);
    if (next.kind() != Token.Kind.LET) {
      boolean otherStatement =
          next.kind() == Token.Kind.PARAM || next.kind() == Token.Kind.DATA
              || next.kind() == Token.Kind.INDEX || next.kind() == Token.Kind.MODEL;
      throw expected(
          "'let' after '" + word.text() + "'",
          next,
          otherStatement
              ? "'" + word.text() + "' marks a let only: every param is kept with the draws, and"
                  + " data is known"
              : "'" + word.text() + " let name = ...' " + (keeping == Statement.Keeping.KEEP
                  ? "keeps a derived quantity with the draws" : "leaves one out of the draws"));
    }
    take();
    return letStatement(keeping, word.position());
  }

  private ModelException notAStatement(Token found) {
    String hint = null;
    if (found.kind() == Token.Kind.NAME) {
      hint = peek(1).kind() == Token.Kind.LET
          ? NameSuggestion.hint(found.text(), MARKS.keySet())
          : NameSuggestion.hint(found.text(), STATEMENT_KEYWORDS);
      if (hint == null && peek(1).kind() == Token.Kind.LET) {
        hint = "only 'keep' or 'hide' may stand before 'let'";
      } else if (hint == null && peek(1).kind() == Token.Kind.TILDE) {
        hint = "declare an unknown with 'param' or known values with 'data', as in 'param "
            + found.text() + " ~ normal(mean = 0, sd = 1)'";
      } else if (hint == null && peek(1).kind() == Token.Kind.EQUALS) {
        hint = "declare a derived quantity with 'let', as in 'let " + found.text() + " = ...'";
      }
    } else if (found.kind() == Token.Kind.WITHIN) {
      hint = "'within' belongs on the line of its distribution; a statement continues onto the"
          + " next line only while a parenthesis or bracket is open";
    }
    return expected("a statement (model, index, data, param, let or check)", found, hint);
  }

  private Statement modelStatement() {
    Token keyword = take();
    Identifier name = name("the model's name after 'model'", null);
    if (modelName != null) {
      throw error(
          keyword.position(),
          "the model is already named '" + modelName.name().text() + "' on line "
              + modelName.position().line(),
          "name the model once");
    }
    endOfStatement("the end of the line after the model name '" + name.text() + "'");
    modelName = new Statement.ModelName(name, keyword.position());
    return modelName;
  }

  private Statement indexStatement() {
    Token keyword = take();
    Identifier name = name("the name of an index set after 'index'", null);
    if (atEndOfStatement()) {
      endOfStatement("the end of the line");
      return new Statement.Index(name, null, null, keyword.position());
    }
    if (!accept(Token.Kind.EQUALS)) {
      throw expected(
          "'=' or the end of the line after the index set '" + name.text() + "'",
          peek(),
          "an index set is written 'index " + name.text() + " = 1 .. 10', or 'index "
              + name.text() + "' to take its size from the data");
    }
    Expression lower = expression();
    expectRange(
        "'..' between the bounds of the index set '" + name.text() + "'",
        "an index set is written 'index " + name.text() + " = 1 .. 10'");
    Expression upper = expression();
    endOfStatement(
        "an operator or the end of the line after the bounds of the index set '"
            + name.text() + "'");
    return new Statement.Index(name, lower, upper, keyword.position());
  }

  private Statement dataStatement() {
    Token keyword = take();
    List<Declarator> targets = new ArrayList<>();
    targets.add(declarator("data"));
    while (accept(Token.Kind.COMMA)) {
      targets.add(declarator("data"));
    }
    Declarator first = targets.get(0);
    String name = first.name().text();
    if (targets.size() > 1) {
      if (at(Token.Kind.EQUALS) || at(Token.Kind.TILDE)) {
        Declarator last = targets.get(targets.size() - 1);
        throw error(
            peek().position(),
            "a 'data' line that lists several names cannot give values or a likelihood",
            "put '" + last.name().text() + "' on a 'data' line of its own");
      }
      endOfStatement("',' or the end of the line after the list of data names");
      return new Statement.Data(targets, null, null, keyword.position());
    }
    List<Statement.InlineValue> values = null;
    if (accept(Token.Kind.EQUALS)) {
      values = inlineValues(first);
    } else if (!at(Token.Kind.TILDE) && !atEndOfStatement()) {
      throw expected(
          "'~', '=', ',' or the end of the line after the declaration of '" + name + "'",
          peek(),
          familyWithoutTildeHint("data", first));
    }
    Distribution likelihood = null;
    Censoring censoring = null;
    if (accept(Token.Kind.TILDE)) {
      likelihood = distribution();
      censoring = censoring(first);
      endOfStatement(
          (censoring == null ? "'within', 'censored'" : "'when'")
              + " or the end of the line after the distribution of '" + name + "'",
          censoring == null ? clauseHint(List.of("within", CENSORED)) : clauseHint(List.of(WHEN)));
    } else {
      endOfStatement("'~' or the end of the line after the values of '" + name + "'");
    }
    return new Statement.Data(targets, values, likelihood, censoring, keyword.position());
  }

  /**
   * The optional {@code censored lo .. hi [when flag]} clause after a data line's distribution;
   * {@code censored} and {@code when} are words only there, so no name of an existing model is
   * taken from it.
   */
  private Censoring censoring(Declarator target) {
    if (!atWord(CENSORED)) {
      return null;
    }
    Token censored = take();
    String shape = "censoring is written 'censored lo .. hi', with inf or -inf for an open side,"
        + " as in 'censored " + target.name().text() + "_seen .. inf'";
    if (atEndOfStatement() || atWord(WHEN)) {
      throw expected("the lower limit after 'censored'", peek(), shape);
    }
    Expression lower = expression();
    expectRange("'..' between the limits after 'censored'", shape);
    if (atEndOfStatement() || atWord(WHEN)) {
      throw expected("the upper limit after '..'", peek(), shape);
    }
    Expression upper = expression();
    Expression when = null;
    if (atWord(WHEN)) {
      take();
      if (atEndOfStatement()) {
        throw expected(
            "a 0/1 expression after 'when'",
            peek(),
            "name the data column that is 1 in the censored rows and 0 in the exact ones");
      }
      when = expression();
    } else if (at(Token.Kind.WITHIN)) {
      throw error(
          peek().position(),
          "'within' must come before 'censored'",
          "write the truncation right after the distribution: ~ family(...) within lo .. hi"
              + " censored a .. b");
    }
    return new Censoring(lower, upper, when, censored.position());
  }

  private boolean atWord(String word) {
    return at(Token.Kind.NAME) && peek().text().equals(word);
  }

  private List<Statement.InlineValue> inlineValues(Declarator target) {
    String name = target.name().text();
    Token start = peek();
    if (target.indexSets().isEmpty()) {
      if (start.kind() == Token.Kind.OPEN_BRACKET) {
        throw error(
            start.position(),
            "'" + name + "' has no index set, so its inline value is one number, not a list",
            "to give several values, declare it over an index set: data " + name
                + "[set] = [1, 2, 3]");
      }
      return List.of(inlineValue(target, false));
    }
    if (target.indexSets().size() > 1) {
      throw error(
          start.position(),
          "inline values can be given only for a scalar or a vector, but '" + name + "' runs over "
              + target.indexSets().size() + " index sets",
          "read it from a data file, with columns " + name + "[1], " + name + "[2], ...");
    }
    if (start.kind() != Token.Kind.OPEN_BRACKET) {
      throw expected(
          "'[' to start the list of values of '" + name + "'",
          start,
          "a vector's values are written as a list: data " + name + "["
              + target.indexSets().get(0).text() + "] = [1, 2, NA]");
    }
    take();
    List<Statement.InlineValue> values = new ArrayList<>();
    while (true) {
      values.add(inlineValue(target, true));
      if (accept(Token.Kind.CLOSE_BRACKET)) {
        return values;
      }
      if (!accept(Token.Kind.COMMA)) {
        throw expected("',' or ']' in the values of '" + name + "'", peek(), null);
      }
    }
  }

  private Statement.InlineValue inlineValue(Declarator target, boolean inList) {
    String name = target.name().text();
    Token start = peek();
    if (start.kind() == Token.Kind.MISSING) {
      if (!inList) {
        throw error(
            start.position(),
            "the scalar '" + name + "' cannot be NA; only values in an inline list can be missing",
            "give its value, or read it from a data file");
      }
      take();
      return new Statement.InlineValue(Double.NaN, true, start.position());
    }
    boolean negative = accept(Token.Kind.MINUS);
    Token number = peek();
    if (number.kind() != Token.Kind.NUMBER) {
      String wanted = negative ? "a number after '-'" : inList ? "a number or NA" : "a number";
      throw expected(
          wanted + " as " + (inList ? "a value" : "the value") + " of '" + name + "'",
          number,
          inList ? null : "an inline scalar is written 'data " + name + " = 5'");
    }
    if (Double.isInfinite(number.number())) {
      throw error(
          number.position(),
          "inline data values must be finite numbers, found 'inf'",
          inList ? "write NA for a missing value" : null);
    }
    take();
    double value = negative ? -number.number() : number.number();
    return new Statement.InlineValue(value, false, start.position());
  }

  private Statement paramStatement() {
    Token keyword = take();
    Declarator target = declarator("param");
    String name = target.name().text();
    if (at(Token.Kind.EQUALS)) {
      throw expected(
          "'~' after the declaration of '" + name + "'",
          peek(),
          "a 'param' is unknown and gets its prior with '~'; a quantity computed from others is"
              + " declared with 'let'");
    }
    if (!accept(Token.Kind.TILDE)) {
      throw expected(
          "'~' after the declaration of '" + name + "'",
          peek(),
          familyWithoutTildeHint("param", target));
    }
    Distribution prior = distribution();
    if (atWord(CENSORED)) {
      throw error(
          peek().position(),
          "a param cannot be censored; 'censored' describes how observed data was seen",
          "to limit a prior to a range, write 'within lo .. hi'");
    }
    endOfStatement(
        "'within' or the end of the line after the distribution of '" + name + "'",
        withinHint());
    return new Statement.Param(target, prior, keyword.position());
  }

  private Statement letStatement(Statement.Keeping keeping, SourcePosition marker) {
    Token keyword = take();
    Declarator target = declarator("let");
    String name = target.name().text();
    if (at(Token.Kind.TILDE)) {
      throw expected(
          "'=' after the declaration of '" + name + "'",
          peek(),
          "a 'let' is computed with '='; a quantity with a distribution is a 'param' (unknown)"
              + " or 'data' (known)");
    }
    if (!accept(Token.Kind.EQUALS)) {
      throw expected("'=' after the declaration of '" + name + "'", peek(), null);
    }
    Expression value = expression();
    endOfStatement("an operator or the end of the line after the value of '" + name + "'");
    return new Statement.Let(target, value, keyword.position(), keeping, marker);
  }

  /**
   * {@code check <name> = <expr>}: one number, so no index sets; a reduction over a set is
   * written with {@code sum(set: ...)} inside the value.
   */
  private Statement checkStatement() {
    Token keyword = take();
    Identifier name = name("a name after 'check'", null);
    if (at(Token.Kind.OPEN_BRACKET)) {
      throw expected(
          "'=' after the name of check '" + name.text() + "'",
          peek(),
          "a check is one number: reduce over an index set inside the value, as in check "
              + name.text() + " = sum(obs: y[obs] ^ 2)");
    }
    if (at(Token.Kind.TILDE)) {
      throw expected(
          "'=' after the name of check '" + name.text() + "'",
          peek(),
          "a check is computed with '=' from a modelled data name, as in check " + name.text()
              + " = sum(obs: y[obs] ^ 2)");
    }
    if (!accept(Token.Kind.EQUALS)) {
      throw expected("'=' after the name of check '" + name.text() + "'", peek(), null);
    }
    inCheck = true;
    Expression value;
    try {
      value = expression();
    } finally {
      inCheck = false;
    }
    endOfStatement("an operator or the end of the line after the value of check '" + name.text() + "'");
    return new Statement.Check(name, value, keyword.position());
  }

  private Declarator declarator(String keyword) {
    Identifier name = name("a name after '" + keyword + "'", null);
    List<Identifier> sets = new ArrayList<>();
    if (accept(Token.Kind.OPEN_BRACKET)) {
      while (true) {
        sets.add(
            name(
                "the name of an index set in the brackets of '" + name.text() + "'",
                "a declaration lists index sets by name, as in " + name.text() + "[obs]"));
        if (accept(Token.Kind.CLOSE_BRACKET)) {
          break;
        }
        if (!accept(Token.Kind.COMMA)) {
          throw expected(
              "',' or ']' after the index set '" + sets.get(sets.size() - 1).text() + "' of '"
                  + name.text() + "'",
              peek(),
              null);
        }
      }
    }
    return new Declarator(name, sets);
  }

  private Distribution distribution() {
    Identifier family =
        familyName(
            name(
                "a family name after '~'",
                "a distribution is written family(argument = value, ...), as in"
                    + " normal(mean = 0, sd = 1)"));
    if (!at(Token.Kind.OPEN_PAREN)) {
      throw expected(
          "'(' after the family name '" + family.text() + "'",
          peek(),
          "a distribution is written " + family.text() + "(argument = value, ...)");
    }
    take();
    List<Argument> arguments = new ArrayList<>();
    if (!accept(Token.Kind.CLOSE_PAREN)) {
      while (true) {
        Token argument = peek();
        if (argument.kind() != Token.Kind.NAME || peek(1).kind() != Token.Kind.EQUALS) {
          Token found = argument.kind() == Token.Kind.NAME ? peek(1) : argument;
          String wanted =
              argument.kind() == Token.Kind.NAME
                  ? "'=' after the argument name '" + argument.text() + "' of '" + family.text()
                      + "'"
                  : "the name of an argument of '" + family.text() + "'";
          throw expected(
              wanted,
              found,
              "every argument of a family is named, as in normal(mean = 0, sd = 1)");
        }
        take();
        take();
        Identifier name = new Identifier(argument.text(), argument.position());
        arguments.add(new Argument(name, expression()));
        if (accept(Token.Kind.CLOSE_PAREN)) {
          break;
        }
        if (!accept(Token.Kind.COMMA)) {
          throw expected(
              "an operator, ',' or ')' after the argument '" + name.text() + "' of '"
                  + family.text() + "'",
              peek(),
              null);
        }
      }
    }
    Truncation truncation = null;
    if (at(Token.Kind.WITHIN)) {
      Token within = take();
      Expression lower = expression();
      expectRange(
          "'..' between the bounds after 'within'",
          "a truncation is written 'within lo .. hi'; use inf or -inf for a side without bound");
      Expression upper = expression();
      truncation = new Truncation(lower, upper, within.position());
    }
    return new Distribution(family, arguments, truncation, family.position());
  }

  // ---------------------------------------------------------------- expressions

  private Expression expression() {
    return additive().expression();
  }

  private Parsed additive() {
    Parsed left = multiplicative();
    while (at(Token.Kind.PLUS) || at(Token.Kind.MINUS)) {
      Token operator = take();
      Parsed right = multiplicative();
      left =
          binary(
              operator,
              operator.kind() == Token.Kind.PLUS
                  ? Expression.Operator.ADD
                  : Expression.Operator.SUBTRACT,
              left,
              right);
    }
    return left;
  }

  private Parsed multiplicative() {
    Parsed left = unary();
    while (at(Token.Kind.STAR) || at(Token.Kind.SLASH)) {
      Token operator = take();
      Parsed right = unary();
      left =
          binary(
              operator,
              operator.kind() == Token.Kind.STAR
                  ? Expression.Operator.MULTIPLY
                  : Expression.Operator.DIVIDE,
              left,
              right);
    }
    return left;
  }

  /** Every recursive path passes through here, so this is where nesting is bounded. */
  private Parsed unary() {
    if (++nesting > MAX_NESTING) {
      throw error(
          peek().position(),
          "this expression is nested more than " + MAX_NESTING + " levels deep",
          "split it into several 'let' statements");
    }
    try {
      if (!at(Token.Kind.MINUS)) {
        return power();
      }
      Token minus = take();
      Parsed operand = unary();
      // A minus written before a literal is part of it, so -inf is an infinite number.
      if (operand.expression() instanceof Expression.Number number) {
        return new Parsed(
            new Expression.Number(-number.value(), minus.position()), operand.height());
      }
      return grown(
          new Expression.Negation(operand.expression(), minus.position()),
          operand.height() + 1,
          minus);
    } finally {
      nesting--;
    }
  }

  private Parsed power() {
    Parsed base = primary();
    if (!at(Token.Kind.CARET)) {
      return base;
    }
    Token caret = take();
    Parsed exponent = unary();
    return binary(caret, Expression.Operator.POWER, base, exponent);
  }

  private Parsed primary() {
    Token token = peek();
    switch (token.kind()) {
      case NUMBER:
        take();
        return new Parsed(new Expression.Number(token.number(), token.position()), 1);
      case NAME:
        return nameOrCall();
      case OPEN_PAREN:
        take();
        Parsed inner = additive();
        if (!accept(Token.Kind.CLOSE_PAREN)) {
          throw expected(
              "an operator or ')' to close the '(' at line " + token.position().line()
                  + ", column " + token.position().column(),
              peek(),
              null);
        }
        return inner;
      case MISSING:
        throw error(
            token.position(),
            "NA (a missing value) can be written only inside an inline data list",
            "as in: data y[obs] = [1.2, NA, 3.4]");
      default:
        throw expected(
            previous == null ? "an expression" : "an expression after " + previous.describe(),
            token,
            continuationHint(token));
    }
  }

  private Parsed nameOrCall() {
    Token nameToken = take();
    Identifier name = new Identifier(nameToken.text(), nameToken.position());
    if (at(Token.Kind.OPEN_PAREN)) {
      if (nameToken.text().equals("sum")) {
        return sum(nameToken, Expression.Reduction.SUM);
      }
      boolean extreme = nameToken.text().equals("max") || nameToken.text().equals("min");
      if (extreme && peek(1).kind() == Token.Kind.NAME) {
        // max(a, b) is the function; max(set: ...) the reduction, told apart by the ':' after
        // the first name, which needs one more token than the lookahead holds: take the '('.
        Token open = take();
        if (peek(1).kind() == Token.Kind.COLON) {
          return sum(nameToken, nameToken.text().equals("max")
              ? Expression.Reduction.MAX : Expression.Reduction.MIN);
        }
        return call(name, open);
      }
      return call(name);
    }
    List<Expression> indexes = new ArrayList<>();
    int height = 1;
    if (accept(Token.Kind.OPEN_BRACKET)) {
      while (true) {
        Parsed index = additive();
        indexes.add(index.expression());
        height = Math.max(height, index.height() + 1);
        if (accept(Token.Kind.CLOSE_BRACKET)) {
          break;
        }
        if (!accept(Token.Kind.COMMA)) {
          throw expected(
              "an operator, ',' or ']' in the indexes of '" + name.text() + "'", peek(), null);
        }
      }
    }
    return grown(new Expression.Name(name, indexes, name.position()), height, nameToken);
  }

  private Parsed call(Identifier function) {
    return call(function, null);
  }

  /** A call; {@code open} is its '(' when already taken, else null. */
  private Parsed call(Identifier function, Token open) {
    if (!Functions.isFunction(function.text())) {
      List<String> known = new ArrayList<>(Functions.names());
      known.add("sum");
      String hint = Functions.replacementHint(function.text());
      if (hint == null) {
        hint = NameSuggestion.hint(function.text(), known);
      }
      throw error(
          function.position(),
          "unknown function '" + function.text() + "'; the functions are "
              + String.join(", ", Functions.names()) + " and sum(set: expression)",
          hint != null ? hint : "to multiply, write '" + function.text() + " * (...)'");
    }
    if (Functions.checkOnly(function.text()) && !inCheck) {
      throw error(
          function.position(),
          "'" + function.text() + "' is an indicator, which only a check may use",
          "an indicator is a step with no slope for a sampler; count with it in a check, as in"
              + " check high = sum(obs: " + function.text() + "(y[obs], 10))");
    }
    if (open == null) {
      take();
    }
    List<Expression> arguments = new ArrayList<>();
    int height = 1;
    if (!accept(Token.Kind.CLOSE_PAREN)) {
      while (true) {
        Parsed argument = additive();
        arguments.add(argument.expression());
        height = Math.max(height, argument.height() + 1);
        if (accept(Token.Kind.CLOSE_PAREN)) {
          break;
        }
        if (!accept(Token.Kind.COMMA)) {
          throw expected(
              "an operator, ',' or ')' in the arguments of '" + function.text() + "'",
              peek(),
              null);
        }
      }
    }
    int arity = Functions.arity(function.text());
    if (arguments.size() != arity) {
      throw error(
          function.position(),
          "'" + function.text() + "' takes " + count(arity, "argument") + ", found "
              + arguments.size(),
          arity == 1
              ? "as in " + function.text() + "(x)"
              : "as in " + function.text() + "(a, b)");
    }
    return grown(
        new Expression.Call(function, arguments, function.position()), height, previous);
  }

  private Parsed sum(Token sumToken, Expression.Reduction reduction) {
    String word = reduction.word();
    if (reduction == Expression.Reduction.SUM) {
      take();
    } else if (!inCheck) {
      throw error(
          sumToken.position(),
          "the largest or smallest over a set, " + word + "(set: ...), is for checks only",
          "a kink at every tie gives a sampler no slope; use it in a check, as in check top = "
              + word + "(obs: y[obs]), or max(a, b) of two values");
    }
    String shape = reduction == Expression.Reduction.SUM
        ? "a sum is written sum(set: expression), as in sum(coef: x[coef])"
        : "written " + word + "(set: expression), as in " + word + "(obs: y[obs])";
    Identifier set = name("the name of an index set after '" + word + "('", shape);
    if (!accept(Token.Kind.COLON)) {
      throw expected("':' after the index set '" + set.text() + "' of the " + word, peek(), shape);
    }
    Parsed body = additive();
    if (!accept(Token.Kind.CLOSE_PAREN)) {
      throw expected("an operator or ')' to close the " + word, peek(), null);
    }
    return grown(
        new Expression.Sum(set, body.expression(), sumToken.position(), reduction),
        body.height() + 1,
        sumToken);
  }

  private Parsed binary(
      Token token, Expression.Operator operator, Parsed left, Parsed right) {
    return grown(
        new Expression.Binary(operator, left.expression(), right.expression(), token.position()),
        Math.max(left.height(), right.height()) + 1,
        token);
  }

  private Parsed grown(Expression expression, int height, Token at) {
    if (height > MAX_HEIGHT) {
      throw error(
          at.position(),
          "this expression is too deeply nested (more than " + MAX_HEIGHT
              + " levels of operations)",
          "split it into several 'let' statements");
    }
    return new Parsed(expression, height);
  }

  // ---------------------------------------------------------------- tokens

  private Identifier name(String wanted, String hint) {
    Token token = peek();
    if (token.kind() != Token.Kind.NAME) {
      throw expected(wanted, token, hint != null ? hint : continuationHint(token), true);
    }
    take();
    return new Identifier(token.text(), token.position());
  }

  /**
   * The whole family name that starts with {@code first}: right after '~', and only there, a
   * hyphen written with no space around it joins two words into one name ({@code half-normal}), as
   * the trade spells these families; everywhere else '-' is minus.
   */
  private Identifier familyName(Identifier first) {
    StringBuilder text = new StringBuilder(first.text());
    int line = first.position().line();
    int end = first.position().column() + first.text().codePointCount(0, first.text().length());
    while (at(Token.Kind.MINUS)) {
      Token hyphen = peek();
      Token next = peek(1);
      boolean joined =
          next.kind() == Token.Kind.NAME
              && hyphen.position().line() == line
              && next.position().line() == line
              && hyphen.position().column() == end
              && next.position().column() == end + 1;
      if (!joined) {
        if (next.kind() == Token.Kind.NAME && next.position().line() == line) {
          throw expected(
              "'(' after the family name '" + text + "'",
              hyphen,
              "a hyphenated family name is written without spaces, as in '" + text + "-"
                  + next.text() + "'");
        }
        break;
      }
      take();
      take();
      text.append('-').append(next.text());
      end = next.position().column() + next.text().codePointCount(0, next.text().length());
    }
    return new Identifier(text.toString(), first.position());
  }

  private void expectRange(String wanted, String hint) {
    if (!accept(Token.Kind.RANGE)) {
      throw expected(wanted, peek(), hint);
    }
  }

  private boolean atEndOfStatement() {
    return at(Token.Kind.NEWLINE) || at(Token.Kind.END);
  }

  private void endOfStatement(String wanted) {
    endOfStatement(wanted, null);
  }

  private void endOfStatement(String wanted, String hint) {
    Token token = peek();
    if (token.kind() == Token.Kind.NEWLINE) {
      take();
      return;
    }
    if (token.kind() == Token.Kind.END) {
      return;
    }
    if (hint == null && token.kind().startsStatement()) {
      hint = "one statement per line: start '" + token.text() + "' on a new line";
    }
    throw expected(wanted, token, hint);
  }

  private String withinHint() {
    return clauseHint(List.of("within"));
  }

  private String clauseHint(List<String> words) {
    Token token = peek();
    return token.kind() == Token.Kind.NAME ? NameSuggestion.hint(token.text(), words) : null;
  }

  private String familyWithoutTildeHint(String keyword, Declarator target) {
    if (peek().kind() == Token.Kind.NAME && peek(1).kind() == Token.Kind.OPEN_PAREN) {
      return "write '~' before the family: " + keyword + " " + written(target) + " ~ "
          + peek().text() + "(...)";
    }
    return null;
  }

  private static String written(Declarator target) {
    if (target.indexSets().isEmpty()) {
      return target.name().text();
    }
    List<String> sets = new ArrayList<>();
    target.indexSets().forEach(set -> sets.add(set.text()));
    return target.name().text() + "[" + String.join(", ", sets) + "]";
  }

  private String continuationHint(Token found) {
    if ((found.kind() == Token.Kind.NEWLINE || found.kind() == Token.Kind.END)
        && previous != null
        && isOperator(previous.kind())) {
      return "a statement continues onto the next line only while a parenthesis or bracket is"
          + " open; wrap the expression in ( ... ) to break it across lines";
    }
    return null;
  }

  private static boolean isOperator(Token.Kind kind) {
    return switch (kind) {
      case PLUS, MINUS, STAR, SLASH, CARET, EQUALS, TILDE, RANGE, COMMA, COLON -> true;
      default -> false;
    };
  }

  private ModelException expected(String wanted, Token found, String hint) {
    return expected(wanted, found, hint, false);
  }

  private ModelException expected(
      String wanted, Token found, String hint, boolean wantedAName) {
    String described = found.describe();
    if (hint == null
        && previous != null
        && previous.kind() == Token.Kind.NUMBER
        && found.kind() == Token.Kind.NAME
        && found.position().line() == previous.position().line()) {
      hint = "to multiply, write '" + previous.text() + " * " + found.text() + "'";
    }
    if (wantedAName && Lexer.RESERVED_WORDS.contains(found.text())) {
      described += ", a reserved word";
    }
    return error(found.position(), "expected " + wanted + ", found " + described, hint);
  }

  private ModelException error(SourcePosition position, String problem, String hint) {
    return ModelException.at(source, position, problem, hint);
  }

  private static String count(int n, String noun) {
    return n + " " + noun + (n == 1 ? "" : "s");
  }

  private Token peek() {
    return peek(0);
  }

  private Token peek(int ahead) {
    while (buffered <= ahead) {
      lookahead[buffered++] = lexer.next();
    }
    return lookahead[ahead];
  }

  private Token take() {
    Token token = peek();
    lookahead[0] = lookahead[1];
    lookahead[1] = null;
    buffered--;
    previous = token;
    return token;
  }

  private boolean at(Token.Kind kind) {
    return peek().kind() == kind;
  }

  private boolean accept(Token.Kind kind) {
    if (at(kind)) {
      take();
      return true;
    }
    return false;
  }
}
