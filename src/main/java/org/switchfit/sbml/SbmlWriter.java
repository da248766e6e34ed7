package org.switchfit.sbml;

import java.io.ByteArrayOutputStream;
import java.nio.file.Path;
import java.util.Map;
import org.sbml.jsbml.Compartment;
import org.sbml.jsbml.Parameter;
import org.sbml.jsbml.SBMLDocument;
import org.sbml.jsbml.SBMLReader;
import org.sbml.jsbml.SBMLWriter;
import org.sbml.jsbml.Species;
import org.switchfit.util.AtomicFiles;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Writes an SBML file back with new values for global parameters, compartment sizes or species initial values
 * (for example fitted parameters), keeping everything else of the original document. Thread-safe.
 */
public final class SbmlWriter {
    private SbmlWriter() {
    }

    /**
     * Reads {@code source}, sets the given values and writes the document to {@code target} atomically.
     * Global parameters get their value, compartments their size, species their initial concentration (or initial
     * amount when the species declares an amount or has only substance units).
     *
     * @param values id to linear value; ids that are not a parameter, compartment or species are skipped
     * @return the number of values written into the document
     * @throws UserInputException when the source cannot be read or written
     */
    public static int writeWithValues(Path source, Path target, Map<String, Double> values) {
        SbmlReader.silenceLogging();
        SBMLDocument doc;
        try {
            synchronized (SbmlReader.PARSE_LOCK) {
                doc = new SBMLReader().readSBML(source.toFile());
            }
        } catch (Exception e) {
            throw new UserInputException(SourceLocation.ofFile(source.toString()), "cannot be read again to write "
                    + "fitted values (" + SbmlReader.firstLine(String.valueOf(e.getMessage())) + ")", e);
        }
        org.sbml.jsbml.Model m = doc.getModel();
        int written = 0;
        for (Map.Entry<String, Double> e : values.entrySet()) {
            double v = e.getValue();
            Parameter p = m.getParameter(e.getKey());
            if (p != null) {
                p.setValue(v);
                written++;
                continue;
            }
            Compartment c = m.getCompartment(e.getKey());
            if (c != null) {
                c.setSize(v);
                written++;
                continue;
            }
            Species s = m.getSpecies(e.getKey());
            if (s != null) {
                if (s.isSetInitialAmount() || s.getHasOnlySubstanceUnits()) {
                    s.setInitialAmount(v);
                } else {
                    s.setInitialConcentration(v);
                }
                written++;
            }
        }
        try {
            ByteArrayOutputStream bos = new ByteArrayOutputStream();
            new SBMLWriter().write(doc, bos);
            AtomicFiles.writeBytes(target, bos.toByteArray());
        } catch (Exception e) {
            throw new UserInputException(SourceLocation.ofFile(target.toString()), "cannot write SBML ("
                    + SbmlReader.firstLine(String.valueOf(e.getMessage())) + "); check the output folder", e);
        }
        return written;
    }
}
