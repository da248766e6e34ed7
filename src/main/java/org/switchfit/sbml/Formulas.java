package org.switchfit.sbml;

import java.io.StringReader;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.sbml.jsbml.ASTNode;
import org.sbml.jsbml.text.parser.FormulaParserLL3;
import org.switchfit.expr.Expr;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Parses infix formulas (observable and noise formulas of problem files) into {@link Expr} trees whose
 * {@link org.switchfit.expr.Op#SYMBOL} leaves name model quantities or other parameters, using JSBML's SBML Level 3
 * infix parser and the same MathML conversion as model files. {@code log(x)} is the natural logarithm (as in the
 * PEtab v1 specification), {@code log10(x)} the decimal one; {@code **} is accepted as a synonym of {@code ^}.
 * Stateless and thread-safe.
 */
public final class Formulas {
    private Formulas() {
    }

    /**
     * Parses one formula.
     *
     * @param formula infix text
     * @param where   location for messages (file, line, column name)
     * @throws UserInputException when the text is not a valid formula
     */
    public static Expr parse(String formula, SourceLocation where) {
        SbmlReader.silenceLogging();
        String text = formula == null ? "" : formula.strip().replace("**", "^");
        if (text.isEmpty()) {
            throw new UserInputException(where, "formula is empty; write an expression such as 'scale * X'");
        }
        ASTNode node;
        try {
            node = ASTNode.parseFormula(text, new FormulaParserLL3(new StringReader("")));
        } catch (Exception | org.sbml.jsbml.text.parser.TokenMgrError e) {
            throw new UserInputException(where, "cannot parse formula '" + text + "': " + problem(text, e)
                    + "; write an infix expression such as 'a * X / (1 + X)'", e);
        }
        String el = where == null ? formula : where.elementId();
        return new MathConverter(null, where == null ? null : where.file()).convert(node, Map.of(),
                el == null ? text : el);
    }

    /** Most characters of the rest of a formula quoted in a message. */
    private static final int SHOWN = 20;

    /**
     * What the parser objected to, in the user's terms: the text from the column it stopped at, or that the formula
     * ends too early. The parser's own message names its exception class and token kinds, so only its column
     * ({@code ... at line 1, column N}, 1-based; JavaCC's message format) is used.
     */
    static String problem(String text, Throwable e) {
        String msg = String.valueOf(e.getMessage());
        Matcher m = Pattern.compile("column (\\d+)").matcher(msg);
        if (!m.find()) {
            return "not an infix expression";
        }
        int col = Integer.parseInt(m.group(1));
        if (msg.contains("Encountered \"<EOF>\"") || col < 1 || col > text.length()) {
            return "it ends too early";
        }
        String rest = text.substring(col - 1);
        return "unexpected '" + (rest.length() > SHOWN ? rest.substring(0, SHOWN) + "..." : rest) + "' at column "
                + col;
    }
}
