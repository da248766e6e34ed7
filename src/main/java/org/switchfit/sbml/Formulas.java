package org.switchfit.sbml;

import java.io.StringReader;
import java.util.Map;
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
            throw new UserInputException(where, "cannot parse formula '" + text + "' (" + SbmlReader.firstLine(
                    String.valueOf(e.getMessage())) + "); write an infix expression such as 'a * X / (1 + X)'", e);
        }
        String el = where == null ? formula : where.elementId();
        return new MathConverter(null, where == null ? null : where.file()).convert(node, Map.of(),
                el == null ? text : el);
    }
}
