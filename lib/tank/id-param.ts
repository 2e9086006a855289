// The one id parser lives in lib/validation; this name stays for the routes that import it from here.
export { idParam } from '@/lib/validation/id-param';
