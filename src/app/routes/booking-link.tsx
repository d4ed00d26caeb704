import { useParams } from "react-router-dom";
import { useSession } from "../../features/auth/api/get-session";
import { BookingLinkPage } from "../../features/bookings/components/BookingLinkPage";

/**
 * `/b/:token`, the confirmation link in a booking e-mail: public, no account. The signed-out
 * session is loaded only for the CSRF token the answer needs.
 */
export function BookingLinkRoute() {
  const { token = "" } = useParams();
  const session = useSession();
  return <BookingLinkPage token={token} ready={session.isSuccess} />;
}
