/** Sends signed-out visitors of any page to the sign-in page; role checks happen in each page. */
import { withAuth } from "next-auth/middleware";

export default withAuth({ pages: { signIn: "/sign-in" } });

export const config = {
  matcher: ["/", "/floor/:path*", "/logbook/:path*", "/reports/:path*", "/floorplans/:path*", "/roster/:path*", "/crew/:path*", "/audit/:path*", "/mail/:path*", "/profile/:path*"],
};
