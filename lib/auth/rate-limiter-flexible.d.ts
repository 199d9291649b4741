// The library's store base class, required by path (its index does not re-export it; its types
// declare it).
declare module "rate-limiter-flexible/lib/RateLimiterStoreAbstract.js" {
  import { RateLimiterStoreAbstract } from "rate-limiter-flexible";
  export default RateLimiterStoreAbstract;
}
