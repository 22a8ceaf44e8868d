package wayward.cli;

import java.io.PrintStream;
import java.util.Set;

/** One command of the command line: its name, the options it takes, its help, and what it does. */
abstract class Command {
    private final String name;
    private final Set<String> options;
    private final String help;

    /**
     * @param options the options it takes, each followed by a value ({@code --input} may come twice)
     * @param help    the text of {@code COMMAND --help}
     */
    Command(String name, Set<String> options, String help) {
        this.name = name;
        this.options = options;
        this.help = help;
    }

    final String name() {
        return name;
    }

    final Set<String> options() {
        return options;
    }

    final String help() {
        return help;
    }

    /**
     * Runs the command.
     *
     * @return the exit code ({@link Main#OK} and the others)
     * @throws CommandExit to end early with a code, the reason already printed
     */
    abstract int run(Options options, PrintStream out, PrintStream err) throws Exception;
}
