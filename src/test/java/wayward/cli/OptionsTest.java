package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import org.junit.jupiter.api.Test;

class OptionsTest {
    private final ByteArrayOutputStream out = new ByteArrayOutputStream();
    private final ByteArrayOutputStream err = new ByteArrayOutputStream();

    private Options parse(Command c, String... args) throws CommandExit {
        return Options.parse(c, args, 0, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
    }

    @Test
    void pairsInOrderAndASecondInputKeptApart() throws CommandExit {
        Options o = parse(new FlowCommand(), "--input", "a.png", "--input", "b.png", "--output", "f.flo");
        assertEquals("a.png", o.get("--input"));
        assertEquals("b.png", o.get("--input2"));
        assertTrue(o.has("--output"));
        assertFalse(o.has("--picture"));
        assertEquals("f.png", o.getOrDefault("--picture", "f.png"));
    }

    @Test
    void anUnknownOptionOrAMissingValueIsAUsageErrorOfOneLine() {
        CommandExit e = assertThrows(CommandExit.class, () -> parse(new RunCommand(), "--confg", "x.toml"));
        assertEquals(Main.USAGE, e.code);
        assertEquals("wayward run: unknown option '--confg' (expected --config)\n", err.toString(StandardCharsets.UTF_8));
        err.reset();
        e = assertThrows(CommandExit.class, () -> parse(new RunCommand(), "--config"));
        assertEquals(Main.USAGE, e.code);
        assertEquals("wayward run: option --config needs a value\n", err.toString(StandardCharsets.UTF_8));
    }

    @Test
    void helpPrintsTheCommandsTextAndEndsWell() {
        CommandExit e = assertThrows(CommandExit.class, () -> parse(new CheckCommand(), "--config", "x", "--help"));
        assertEquals(Main.OK, e.code);
        assertTrue(out.toString(StandardCharsets.UTF_8).startsWith("usage: java -jar wayward.jar check --config FILE"));
    }

    @Test
    void aMissingConfigIsAUsageErrorAndAWrongOneEndsWith78() throws Exception {
        Options none = Options.of("run", java.util.Map.of());
        PrintStream e = new PrintStream(err, true, StandardCharsets.UTF_8);
        assertEquals(Main.USAGE, assertThrows(CommandExit.class, () -> none.config(null, e)).code);
        java.nio.file.Path bad = java.nio.file.Files.createTempFile("wayward-options", ".toml");
        try {
            java.nio.file.Files.writeString(bad, "[service]\nno_such_key = 1\n");
            Options o = Options.of("run", java.util.Map.of("--config", bad.toString()));
            assertEquals(Main.CONFIG, assertThrows(CommandExit.class, () -> o.config(null, e)).code);
            assertTrue(err.toString(StandardCharsets.UTF_8).contains("no_such_key"), err.toString(StandardCharsets.UTF_8));
        } finally {
            java.nio.file.Files.deleteIfExists(bad);
        }
    }
}
