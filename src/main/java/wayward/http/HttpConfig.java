package wayward.http;

/**
 * The status server's address from {@code [service] http}, and its access token.
 *
 * @param host      address to bind (127.0.0.1 by default)
 * @param port      TCP port; 0 picks a free one (logged)
 * @param tokenFile file holding the bearer token, or null
 * @param token     the token's bytes (never logged or printed), or null: then only loopback clients are served
 * @param maxConnections connections served at once at most; more are closed at once, so that a flood of idle
 *                  connections never takes the file descriptors the cameras, clips and outbox need
 */
public record HttpConfig(String host, int port, String tokenFile, byte[] token, int maxConnections) {
    /** Default of {@link #maxConnections}: well below the 1024 descriptors a process gets by default (ulimit -n). */
    public static final int DEFAULT_MAX_CONNECTIONS = 200;
    public static final int MAX_MAX_CONNECTIONS = 10_000;
    /** A request's line and headers must arrive within this many seconds of the connection or the last answer. */
    public static final int HEADER_SECONDS = 10;
    /** A connection with nothing read or written for this long is closed. */
    public static final int IDLE_SECONDS = 60;
    /** The status server's address when {@code [service] http} is not given: loopback only. */
    public static final String DEFAULT_HOST = "127.0.0.1";
    public static final int DEFAULT_PORT = 7431;
    public static final String DEFAULT_ADDRESS = DEFAULT_HOST + ":" + DEFAULT_PORT;

    /**
     * The token's name, which events record as who muted or unmuted: its file's name without the extension
     * ({@code /etc/wayward/control-room.token} → {@code control-room}); null without a token.
     */
    public String tokenName() {
        if (tokenFile == null) {
            return null;
        }
        String name = java.nio.file.Path.of(tokenFile).getFileName().toString();
        int dot = name.indexOf('.');
        return dot > 0 ? name.substring(0, dot) : name;
    }

    /** True when the address is a loopback address, where a token is optional. */
    public boolean loopback() {
        return host.equals("localhost") || host.startsWith("127.") || host.equals("::1") || host.equals("[::1]");
    }

    @Override
    public String toString() {
        return "HttpConfig[" + host + ":" + port + ", tokenFile=" + tokenFile + ", maxConnections=" + maxConnections
                + "]";
    }
}
