package wayward.http;

/**
 * The status server's address from {@code [service] http}, and its access token.
 *
 * @param host      address to bind (127.0.0.1 by default)
 * @param port      TCP port; 0 picks a free one (logged)
 * @param tokenFile file holding the bearer token, or null
 * @param token     the token's bytes (never logged or printed), or null: then only loopback clients are served
 */
public record HttpConfig(String host, int port, String tokenFile, byte[] token) {
    /** The status server's address when {@code [service] http} is not given: loopback only. */
    public static final String DEFAULT_HOST = "127.0.0.1";
    public static final int DEFAULT_PORT = 8786;
    public static final String DEFAULT_ADDRESS = DEFAULT_HOST + ":" + DEFAULT_PORT;

    /** True when the address is a loopback address, where a token is optional. */
    public boolean loopback() {
        return host.equals("localhost") || host.startsWith("127.") || host.equals("::1") || host.equals("[::1]");
    }

    @Override
    public String toString() {
        return "HttpConfig[" + host + ":" + port + ", tokenFile=" + tokenFile + "]";
    }
}
