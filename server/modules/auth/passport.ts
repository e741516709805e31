import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { AuthService } from './service';

/** A Passport instance of our own (not the global one), so each app built in tests is independent. */
export function createPassport(auth: AuthService) {
  const passport = new Passport();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      auth
        .checkCredentials(email, password)
        .then((result) => (result.ok ? done(null, result.user) : done(null, false, { message: result.reason })))
        .catch(done);
    }),
  );
  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser((id: number, done) => {
    // false signs the session out: the account was deleted or suspended since it signed in
    auth
      .activeUser(id)
      .then((user) => done(null, user ?? false))
      .catch(done);
  });
  return passport;
}
