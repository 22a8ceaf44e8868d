package wayward.cli;

import java.io.PrintStream;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The {@code wayward} command line: finds the command (one class each, {@link Command}), parses its options
 * ({@link Options}) and runs it. {@link #main} is the only caller of System.exit; {@link #execute} runs a command
 * and returns its exit code (tests call it directly).
 */
public final class Main {
    public static final int OK = 0;
    public static final int FAILED = 1;
    /** Wrong command line (common practice for usage errors). */
    public static final int USAGE = 2;
    /** EX_NOINPUT of BSD sysexits.h: an input file is missing or unreadable. */
    public static final int NO_INPUT = 66;
    /** EX_CONFIG of BSD sysexits.h: the configuration is wrong. */
    public static final int CONFIG = 78;

    private static final String HELP = String.join("\n",
            "wayward: raises an alert when something moves the wrong way inside a marked zone of a camera picture.",
            "",
            "usage: java -jar wayward.jar COMMAND [options]",
            "",
            "commands:",
            "  run     --config FILE                     run the service on the configured cameras (webhooks, MQTT)",
            "  check   --config FILE                     check a config; print the effective config (secrets masked)",
            "  replay  --config FILE --input VIDEO [--camera ID] [--report DIR] [--annotate OUT.mp4]",
            "                                            analyse a recorded file as fast as possible; events on stdout",
            "  what-if --report DIR [--min-travel-px P] [--hold-seconds S] [--onset-level X] ...",
            "                                            re-run only the rules of a replay report with other settings",
            "  demo    [--config FILE] [--loops N]       run on the bundled demo scene (conf/demo.toml), looped",
            "  bench   --input VIDEO [--cameras N] [--config FILE]",
            "                                            CPU cost per camera and stage, to size a server",
            "  flow    --input A --input B --output OUT.flo [--picture OUT.png]",
            "          --input VIDEO --at SECONDS --output OUT.flo [--picture OUT.png]",
            "                                            optical flow between two pictures (Middlebury .flo + colour wheel PNG)",
            "  help                                      this text; COMMAND --help for one command",
            "",
            "exit codes: 0 done, 1 failed, 2 bad command line, 66 input file missing, 78 config errors");

    /** The commands, in the order the help lists them. */
    private static final Map<String, Command> COMMANDS = new LinkedHashMap<>();

    static {
        for (Command c : List.of(new RunCommand(), new CheckCommand(), new ReplayCommand(), new WhatIfCommand(),
                new DemoCommand(), new BenchCommand(), new FlowCommand(), new MakeSceneCommand())) {
            COMMANDS.put(c.name(), c);
        }
    }

    private Main() {
    }

    public static void main(String[] args) {
        // exit explicitly: library threads (Netty, FFmpeg) must not keep a finished command alive
        System.exit(execute(args, System.out, System.err));
    }

    /** Runs one command; returns its exit code. Never calls System.exit. */
    public static int execute(String[] args, PrintStream out, PrintStream err) {
        if (args.length == 0) {
            err.println(HELP);
            return USAGE;
        }
        String name = args[0];
        if (name.equals("help") || name.equals("--help") || name.equals("-h")) {
            out.println(HELP);
            return OK;
        }
        Command command = COMMANDS.get(name);
        if (command == null) {
            err.println("wayward: unknown command '" + name + "' (expected run, check, replay, what-if, demo, bench, flow or help)");
            return USAGE;
        }
        try {
            return command.run(Options.parse(command, args, 1, out, err), out, err);
        } catch (CommandExit e) {
            return e.code;
        } catch (wayward.service.Lifecycle.StartFailed e) {
            // one line naming what failed and why, e.g. "status server: 127.0.0.1:7431: address already in use …"
            err.println("wayward " + name + ": " + e.getMessage());
            return FAILED;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            err.println("wayward " + name + ": interrupted");
            return FAILED;
        } catch (java.io.IOException e) {
            // a disk or file fault at start (data folder, outbox, evidence folder): one line naming the file
            err.println("wayward " + name + ": " + describe(e));
            return FAILED;
        } catch (Exception e) {
            err.println("wayward " + name + ": " + e);
            return FAILED;
        }
    }

    /**
     * An I/O fault in one line: its message, and what kind of fault when the message is only a file's name (the
     * JDK's file-system faults say "access denied" or "no such file" by their class alone).
     */
    static String describe(java.io.IOException e) {
        if (e instanceof java.nio.file.FileSystemException f && f.getReason() == null) {
            String kind = f.getClass().getSimpleName().replace("Exception", "")
                    .replaceAll("([a-z])([A-Z])", "$1 $2").toLowerCase(java.util.Locale.ROOT);
            return f.getMessage() + " (" + kind + ")";
        }
        return e.getMessage() != null ? e.getMessage() : e.toString();
    }
}
