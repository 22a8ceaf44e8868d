package wayward.cli;

/** Ends a command early with an exit code; the message has already been printed. */
final class CommandExit extends Exception {
    private static final long serialVersionUID = 1L;
    final int code;

    CommandExit(int code) {
        super(null, null, false, false);
        this.code = code;
    }
}
