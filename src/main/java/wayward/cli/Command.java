package wayward.cli;

import java.io.PrintStream;
import java.util.Set;

/** One command of the command line: its name, the options it takes, its help, and what it does. */
interface Command {
    String name();

    /** The options it takes, each followed by a value ({@code --input} may come twice). */
    Set<String> options();

    /** The text of {@code COMMAND --help}. */
    String help();

    /**
     * Runs the command.
     *
     * @return the exit code ({@link Main#OK} and the others)
     * @throws CommandExit to end early with a code, the reason already printed
     */
    int run(Options options, PrintStream out, PrintStream err) throws Exception;
}
