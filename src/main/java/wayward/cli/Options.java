package wayward.cli;

import java.io.PrintStream;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.TreeSet;
import wayward.config.ConfigException;
import wayward.config.ConfigLoader;
import wayward.config.SiteConfig;

/**
 * A command's options as given ({@code --name value} pairs; a second {@code --input} is kept as
 * {@code --input2}), parsed by {@link #parse}, the one parser of the command line.
 */
final class Options {
    private final String command;
    private final Map<String, String> values;

    private Options(String command, Map<String, String> values) {
        this.command = command;
        this.values = values;
    }

    /** For tests and callers that build options by hand. */
    static Options of(String command, Map<String, String> values) {
        return new Options(command, new LinkedHashMap<>(values));
    }

    /**
     * The options after the command name; prints the command's help (and ends with {@link Main#OK}) on
     * {@code --help}, or a one-line reason (and ends with {@link Main#USAGE}) on an unknown option or a missing
     * value.
     */
    static Options parse(Command c, String[] args, int from, PrintStream out, PrintStream err) throws CommandExit {
        Map<String, String> values = new LinkedHashMap<>();
        for (int i = from; i < args.length; i++) {
            String a = args[i];
            if (a.equals("--help") || a.equals("-h")) {
                out.println(c.help());
                throw new CommandExit(Main.OK);
            }
            if (!c.options().contains(a)) {
                err.println("wayward " + c.name() + ": unknown option '" + a + "' (expected "
                        + String.join(", ", new TreeSet<>(c.options())) + ")");
                throw new CommandExit(Main.USAGE);
            }
            if (i + 1 >= args.length) {
                err.println("wayward " + c.name() + ": option " + a + " needs a value");
                throw new CommandExit(Main.USAGE);
            }
            String value = args[++i];
            if (a.equals("--input") && values.containsKey("--input")) {
                values.put("--input2", value);
            } else {
                values.put(a, value);
            }
        }
        return new Options(c.name(), values);
    }

    String get(String name) {
        return values.get(name);
    }

    String getOrDefault(String name, String fallback) {
        return values.getOrDefault(name, fallback);
    }

    boolean has(String name) {
        return values.containsKey(name);
    }

    /** Every option given, in order. */
    Map<String, String> all() {
        return values;
    }

    /** Prints {@code wayward COMMAND: message} and ends the command with {@code code}. */
    CommandExit fail(PrintStream err, int code, String message) {
        err.println("wayward " + command + ": " + message);
        return new CommandExit(code);
    }

    /**
     * The value of a required option; without it, prints {@code wayward COMMAND: NAME WHAT is required} and the
     * hint, and ends with the usage code.
     */
    String required(String name, String what, String hint, PrintStream err) throws CommandExit {
        String v = get(name);
        if (v == null) {
            throw fail(err, Main.USAGE, name + " " + what + " is required" + hint);
        }
        return v;
    }

    /** Loads the config named by --config (or the fallback); prints the errors and ends with 78 if it is wrong. */
    SiteConfig config(String fallback, PrintStream err) throws CommandExit {
        String file = getOrDefault("--config", fallback);
        if (file == null) {
            throw fail(err, Main.USAGE, "--config FILE is required");
        }
        try {
            return ConfigLoader.load(Path.of(file));
        } catch (ConfigException e) {
            for (String line : e.shown()) {
                err.println(line);
            }
            err.println(e.errors().size() == 1 ? "1 error; nothing started"
                    : e.errors().size() + " errors; nothing started");
            throw new CommandExit(Main.CONFIG);
        }
    }
}
